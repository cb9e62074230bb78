import { pageUser } from "@/server/auth/page-guard";
import { EmptyState } from "@/components/ui/empty-state";
import { ChemicalSafetyNote } from "@/components/ui/caution";

export const metadata = { title: "Compound registry" };

export default async function CompoundsPage() {
  await pageUser();
  return (
    <main className="mx-auto w-full max-w-6xl px-6 py-6">
      <h1 className="mb-1">Compound registry</h1>
      <p className="mb-4 text-sm text-ink-muted">Compounds are shared by every campaign; batches and stock solutions belong to a compound.</p>
      <ChemicalSafetyNote className="mb-4" />
      <EmptyState title="No compounds registered yet.">
        Chemists register compounds from a SMILES string or a molfile, one at a time or in bulk from CSV, XLSX or SDF.
      </EmptyState>
    </main>
  );
}
