import Link from "next/link";
import { pageUser } from "@/server/auth/page-guard";
import { canWriteCompounds, compoundScope } from "@/server/auth/compound-access";
import { listLibraries } from "@/server/services/compounds";
import { EmptyState } from "@/components/ui/empty-state";
import { CreateLibraryForm } from "./library-forms";

export const metadata = { title: "Libraries" };
export const dynamic = "force-dynamic";

export default async function LibrariesPage() {
  const user = await pageUser();
  const [libs, writer] = await Promise.all([compoundScope(user).then(listLibraries), canWriteCompounds(user)]);
  return (
    <main className="mx-auto w-full max-w-6xl px-6 py-6">
      <p className="mb-1 text-xs text-ink-muted">
        <Link href="/compounds">Compound registry</Link> / libraries
      </p>
      <h1 className="mb-3">Libraries</h1>
      <div className={`grid grid-cols-1 gap-4 ${writer ? "lg:grid-cols-[1fr_360px]" : ""}`}>
        {libs.length === 0 ? (
          <EmptyState title="No libraries yet.">
            A library is a named set of compounds, e.g. a screening set or a series follow-up.
          </EmptyState>
        ) : (
          <section className="card p-3">
            <table className="table-dense">
              <thead>
                <tr>
                  <th>Library</th>
                  <th className="text-right">Compounds</th>
                  <th>Description</th>
                  <th>Created by</th>
                  <th>Created</th>
                </tr>
              </thead>
              <tbody>
                {libs.map((l) => (
                  <tr key={l.id}>
                    <td>
                      <Link href={`/compounds/libraries/${l.id}`}>{l.name}</Link>
                    </td>
                    <td className="num text-right">{l.members.toLocaleString("en")}</td>
                    <td className="text-ink-muted">{l.description ?? ""}</td>
                    <td>{l.createdBy ?? "—"}</td>
                    <td className="num">{l.createdAt.toISOString().slice(0, 10)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </section>
        )}
        {writer ? <CreateLibraryForm /> : null}
      </div>
    </main>
  );
}
