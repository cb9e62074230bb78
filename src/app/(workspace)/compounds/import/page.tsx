import Link from "next/link";
import { notFound } from "next/navigation";
import { pageUser } from "@/server/auth/page-guard";
import { canWriteCompounds } from "@/server/auth/compound-access";
import { listImports } from "@/server/services/compounds";
import { ChemicalSafetyNote } from "@/components/ui/caution";
import { ImportUploadForm } from "./upload-form";

export const metadata = { title: "Bulk import" };
export const dynamic = "force-dynamic";

const COLUMNS: [string, string][] = [
  ["smiles", "structure (or a molfile column; SDF records carry their own)"],
  ["name", "compound name"],
  ["aliases", "supplier codes, separated by ;"],
  ["supplier, purity_pct, amount + amount_unit (or amount_mg), salt_form, batch_date", "the first batch"],
  [
    "stock_concentration_mm, stock_solvent, stock_volume_ul, stock_location, stock_date",
    "a stock solution from that batch",
  ],
];

export default async function ImportPage() {
  const user = await pageUser();
  if (!(await canWriteCompounds(user))) notFound();
  const recent = await listImports(user, 10);
  return (
    <main className="mx-auto w-full max-w-5xl px-6 py-6">
      <p className="mb-1 text-xs text-ink-muted">
        <Link href="/compounds">Compound registry</Link> / bulk import
      </p>
      <h1 className="mb-3">Bulk import</h1>
      <ChemicalSafetyNote className="mb-3" />
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-[1fr_1fr]">
        <ImportUploadForm />
        <section className="card p-4 text-sm">
          <h2 className="mb-2 text-sm font-semibold">Columns read</h2>
          <table className="table-dense">
            <tbody>
              {COLUMNS.map(([c, what]) => (
                <tr key={c}>
                  <td className="font-mono text-xs">{c}</td>
                  <td className="text-xs text-ink-muted">{what}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-2 text-xs text-ink-muted">
            Other columns are ignored and listed in the preview. Headers are matched without regard to case, spaces or
            units in brackets.
          </p>
        </section>
      </div>
      {recent.length > 0 ? (
        <section className="card mt-4 p-3">
          <h2 className="mb-2 text-sm font-semibold">Recent imports</h2>
          <table className="table-dense">
            <thead>
              <tr>
                <th>File</th>
                <th>Status</th>
                <th className="text-right">Records</th>
                <th>By</th>
                <th>Uploaded (UTC)</th>
              </tr>
            </thead>
            <tbody>
              {recent.map((r) => (
                <tr key={r.id}>
                  <td>
                    <Link href={`/compounds/import/${r.id}`}>{r.fileName}</Link>
                  </td>
                  <td>{r.status}</td>
                  <td className="num text-right">{r.progressTotal.toLocaleString("en")}</td>
                  <td>{r.by ?? "—"}</td>
                  <td className="num">{r.createdAt.toISOString().slice(0, 16).replace("T", " ")}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ) : null}
    </main>
  );
}
