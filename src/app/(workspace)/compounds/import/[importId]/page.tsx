import Link from "next/link";
import { notFound } from "next/navigation";
import { pageUser } from "@/server/auth/page-guard";
import { canWriteCompounds } from "@/server/auth/compound-access";
import { AppError } from "@/server/errors";
import { getImport } from "@/server/services/compounds";
import { ChemicalSafetyNote } from "@/components/ui/caution";
import { ImportJob } from "./import-job";

export const metadata = { title: "Bulk import" };
export const dynamic = "force-dynamic";

export default async function ImportJobPage({ params }: { params: Promise<{ importId: string }> }) {
  const user = await pageUser();
  const { importId } = await params;
  try {
    await getImport(user, importId);
  } catch (e) {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  }
  const canWrite = await canWriteCompounds(user);
  return (
    <main className="mx-auto w-full max-w-6xl px-6 py-6">
      <p className="mb-1 text-xs text-ink-muted">
        <Link href="/compounds">Compound registry</Link> / <Link href="/compounds/import">bulk import</Link>
      </p>
      <h1 className="mb-3">Bulk import</h1>
      <ChemicalSafetyNote className="mb-3" />
      <ImportJob id={importId} canWrite={canWrite} />
    </main>
  );
}
