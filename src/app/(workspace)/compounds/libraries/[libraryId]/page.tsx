import Link from "next/link";
import { notFound } from "next/navigation";
import { pageUser } from "@/server/auth/page-guard";
import { canWriteCompounds, compoundScope } from "@/server/auth/compound-access";
import { AppError } from "@/server/errors";
import { getLibrary } from "@/server/services/compounds";
import { AddMembersForm, RemoveMemberButton } from "../library-forms";

export const dynamic = "force-dynamic";

export default async function LibraryPage({ params }: { params: Promise<{ libraryId: string }> }) {
  const user = await pageUser();
  const { libraryId } = await params;
  if (!/^[0-9a-f-]{36}$/i.test(libraryId)) notFound();
  let lib: Awaited<ReturnType<typeof getLibrary>>;
  try {
    lib = await getLibrary(await compoundScope(user), libraryId);
  } catch (e) {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  }
  const writer = await canWriteCompounds(user);
  return (
    <main className="mx-auto w-full max-w-6xl px-6 py-6">
      <p className="mb-1 text-xs text-ink-muted">
        <Link href="/compounds">Compound registry</Link> / <Link href="/compounds/libraries">libraries</Link>
      </p>
      <h1 className="mb-1">{lib.name}</h1>
      {lib.description ? <p className="mb-3 text-sm text-ink-muted">{lib.description}</p> : null}
      <p className="mb-3 text-sm">
        {lib.members.length.toLocaleString("en")} compound(s).{" "}
        <Link href={`/compounds?library=${lib.id}`}>Search within this library</Link>
      </p>
      <div className={`grid grid-cols-1 gap-4 ${writer ? "lg:grid-cols-[1fr_320px]" : ""}`}>
        <section className="card p-3">
          <table className="table-dense">
            <thead>
              <tr>
                <th>Registry ID</th>
                <th>Name</th>
                <th>Formula</th>
                <th className="text-right">MW (g/mol)</th>
                <th className="text-right">cLogP</th>
                {writer ? <th /> : null}
              </tr>
            </thead>
            <tbody>
              {lib.members.map((m) => (
                <tr key={m.id}>
                  <td className="font-mono">
                    <Link href={`/compounds/${m.registryId}`}>{m.registryId}</Link>
                  </td>
                  <td>{m.name ?? "—"}</td>
                  <td>{m.formula}</td>
                  <td className="num text-right">{m.mw.toFixed(2)}</td>
                  <td className="num text-right">{m.clogp.toFixed(2)}</td>
                  {writer ? (
                    <td className="text-right">
                      <RemoveMemberButton libraryId={lib.id} registryId={m.registryId} />
                    </td>
                  ) : null}
                </tr>
              ))}
            </tbody>
          </table>
        </section>
        {writer ? (
          <section className="card p-3">
            <AddMembersForm libraryId={lib.id} />
          </section>
        ) : null}
      </div>
    </main>
  );
}
