import Link from "next/link";
import { pageUser } from "@/server/auth/page-guard";
import { canWriteCompounds, compoundScope } from "@/server/auth/compound-access";
import { listLibraries } from "@/server/services/compounds";
import { ChemicalSafetyNote } from "@/components/ui/caution";
import { COMPUTED_PROPERTIES_CAUTION } from "@/lib/chem/cautions";
import { CompoundGrid } from "./_components/compound-grid";

export const metadata = { title: "Compound registry" };
export const dynamic = "force-dynamic";

const one = (v: string | string[] | undefined) => (typeof v === "string" ? v.slice(0, 500) : "");

export default async function CompoundsPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await pageUser();
  const sp = await searchParams;
  const [writer, libraries] = await Promise.all([canWriteCompounds(user), compoundScope(user).then(listLibraries)]);
  return (
    <main className="mx-auto w-full max-w-7xl px-6 py-6">
      <div className="mb-1 flex flex-wrap items-baseline gap-3">
        <h1>Compound registry</h1>
        <nav className="ml-auto flex gap-2" aria-label="Registry">
          <Link href="/compounds/libraries" className="btn-quiet no-underline">
            Libraries
          </Link>
          {writer ? (
            <>
              <Link href="/compounds/import" className="btn-quiet no-underline">
                Bulk import
              </Link>
              <Link href="/compounds/register" className="btn-primary no-underline">
                Register compound
              </Link>
            </>
          ) : null}
        </nav>
      </div>
      <p className="mb-3 text-sm text-ink-muted">
        Compounds are shared by every campaign; batches and stock solutions belong to a compound. Search by registry ID,
        name or supplier code, or by a substructure.
        {writer
          ? null
          : " You see the compounds of your campaigns (on their plate maps, results or hit lists); chemists and administrators see the whole registry."}
      </p>
      <ChemicalSafetyNote className="mb-3" />
      <CompoundGrid
        libraries={libraries.map((l) => ({ id: l.id, name: l.name }))}
        initial={{
          q: one(sp.q),
          substructure: one(sp.substructure),
          library: libraries.some((l) => l.id === sp.library) ? one(sp.library) : "",
        }}
      />
      <p className="mt-3 text-2xs text-ink-muted">
        {COMPUTED_PROPERTIES_CAUTION} Acceptors follow the rule-of-five definition (all N and O atoms).
      </p>
    </main>
  );
}
