import Link from "next/link";
import { notFound } from "next/navigation";
import { pageParam, pageUser } from "@/server/auth/page-guard";
import { canWriteCompounds, compoundScope } from "@/server/auth/compound-access";
import { AppError } from "@/server/errors";
import {
  getCompound,
  resultsForCompound,
  structureSvgOf,
  type CompoundDetail,
  type CompoundResultRow,
} from "@/server/services/compounds";
import { COMPUTED_PROPERTIES_CAUTION } from "@/lib/chem/cautions";
import { ChemicalSafetyNote, ResearchUseNote } from "@/components/ui/caution";
import { AddBatchForm, AddStockForm, EditNamesForm, EditStructureForm } from "./compound-forms";

export const dynamic = "force-dynamic";

export async function generateMetadata({ params }: { params: Promise<{ registryId: string }> }) {
  return { title: (await params).registryId };
}

const n = (x: number | null | undefined, d: number) => (x === null || x === undefined ? "—" : x.toFixed(d));

function PropertyTable({ c }: { c: CompoundDetail }) {
  const rows: [string, string, string][] = [
    ["Formula", c.formula, ""],
    ["Molecular weight", n(c.mw, 2), "g/mol"],
    ["Exact mass (monoisotopic)", n(c.exactMass, 4), "Da"],
    ["Heavy atoms", String(c.heavyAtoms), ""],
    ["cLogP (openchemlib estimate)", n(c.clogp, 2), ""],
    ["H-bond donors", String(c.hbd), ""],
    ["H-bond acceptors (rule of five: all N and O)", String(c.hba), ""],
    ["TPSA", n(c.tpsa, 1), "Å²"],
    ["Rotatable bonds", String(c.rotatableBonds), ""],
  ];
  return (
    <table className="table-dense" aria-label="Computed properties">
      <tbody>
        {rows.map(([k, v, u]) => (
          <tr key={k}>
            <th className="w-1/2 font-normal">{k}</th>
            <td className="num text-right">{v}</td>
            <td className="w-14 text-xs text-ink-muted">{u}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

const KIND: Record<string, string> = {
  "single-dose": "single-dose screen",
  "dose-response": "dose-response",
  mechanism: "mechanism study",
};

function ResultsTable({ rows }: { rows: CompoundResultRow[] }) {
  return (
    <table className="table-dense">
      <thead>
        <tr>
          <th>Campaign</th>
          <th>Experiment</th>
          <th>Kind</th>
          <th className="text-right">Inhibition (%)</th>
          <th>Hit</th>
          <th className="text-right">IC50 (µM)</th>
          <th className="text-right">Hill slope</th>
          <th>Mechanism</th>
          <th className="text-right">Ki (µM)</th>
          <th>Flags</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={`${r.experimentId}`}>
            <td>{r.campaign}</td>
            <td>
              <Link href={`/campaigns/${r.campaignId}/analyses/${r.experimentId}`}>{r.experiment}</Link>
            </td>
            <td>{KIND[r.kind] ?? r.kind}</td>
            <td className="num text-right">{n(r.pctInhibition, 1)}</td>
            <td>
              {r.hit === null ? "—" : r.hit ? <span className="chip bg-accent-soft text-accent">hit</span> : "no"}
            </td>
            <td className="num text-right">
              {r.ic50Um === null
                ? "—"
                : `${r.ic50Qualifier && r.ic50Qualifier !== "=" ? `${r.ic50Qualifier} ` : ""}${r.ic50Um.toPrecision(3)}`}
            </td>
            <td className="num text-right">{n(r.hill, 2)}</td>
            <td>{r.mechanism ? `${r.mechanism}${r.mechanismLabel ? ` (${r.mechanismLabel})` : ""}` : "—"}</td>
            <td className="num text-right">{r.kiUm === null ? "—" : r.kiUm.toPrecision(3)}</td>
            <td className="text-xs text-warn">{r.flags.join(", ")}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export default async function CompoundPage({ params }: { params: Promise<{ registryId: string }> }) {
  const user = await pageUser();
  const { registryId } = await params;
  let c: CompoundDetail;
  try {
    c = await getCompound(await compoundScope(user), pageParam("registryId", registryId));
  } catch (e) {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  }
  const [writer, results, svg] = await Promise.all([
    canWriteCompounds(user),
    resultsForCompound(user, c.registryId),
    // Drawn in the chemistry worker pool and cached; a drawing that fails leaves a sentence instead.
    structureSvgOf(c.structureKey, { width: 420, height: 300, idPrefix: "main-", stereoLabels: true }).catch(
      () => null,
    ),
  ]);
  return (
    <main className="mx-auto w-full max-w-6xl px-6 py-6">
      <p className="mb-1 text-xs text-ink-muted">
        <Link href="/compounds">Compound registry</Link> / {c.registryId}
      </p>
      <div className="mb-4 flex flex-wrap items-baseline gap-3">
        <h1 className="font-mono">{c.registryId}</h1>
        <span className="text-lg text-ink-soft">{c.name ?? "unnamed"}</span>
        {c.aliases.map((a) => (
          <span key={a} className="chip bg-paper-sunk text-ink-soft">
            {a}
          </span>
        ))}
      </div>

      <div className="grid grid-cols-1 gap-4 lg:grid-cols-[440px_1fr]">
        <section className="card p-3" aria-label="Structure">
          {svg ? (
            <div className="flex justify-center" dangerouslySetInnerHTML={{ __html: svg }} />
          ) : (
            <p className="py-8 text-center text-sm text-ink-muted">
              The drawing could not be made just now; the structure is given as SMILES below.
            </p>
          )}
          <p className="mt-2 break-all font-mono text-xs text-ink-soft" title="Canonical SMILES (openchemlib)">
            {c.smiles}
          </p>
          {c.distinctReason ? (
            <p className="mt-2 text-xs text-ink-muted">Registered as a distinct stereo form: {c.distinctReason}</p>
          ) : null}
          <p className="mt-2 text-2xs text-ink-muted">
            Registered {c.registeredAt.slice(0, 10)}
            {c.registeredBy ? ` by ${c.registeredBy}` : ""}. The parent structure is registered; salts and solvates
            belong to batches.
          </p>
        </section>
        <section className="card p-3" aria-label="Properties">
          <h2 className="mb-2 text-sm font-semibold">Computed properties</h2>
          <PropertyTable c={c} />
          <p className="mt-2 text-2xs text-ink-muted">{COMPUTED_PROPERTIES_CAUTION}</p>
        </section>
      </div>

      <section className="card mt-4 p-3" aria-label="Batches">
        <h2 className="mb-2 text-sm font-semibold">Batches</h2>
        {c.batches.length === 0 ? (
          <p className="text-sm text-ink-muted">No batch recorded yet.</p>
        ) : (
          <table className="table-dense">
            <thead>
              <tr>
                <th>Batch</th>
                <th>Supplier</th>
                <th className="text-right">Purity (%)</th>
                <th className="text-right">Amount</th>
                <th>Salt / solvate form</th>
                <th>Date</th>
                <th>Registered by</th>
                <th>Notes</th>
              </tr>
            </thead>
            <tbody>
              {c.batches.map((b) => (
                <tr key={b.batchNumber}>
                  <td className="font-mono">
                    {c.registryId}-{String(b.batchNumber).padStart(2, "0")}
                  </td>
                  <td>{b.supplier ?? "—"}</td>
                  <td className="num text-right">{n(b.purityPct, 1)}</td>
                  <td className="num text-right">{b.amount === null ? "—" : `${b.amount} ${b.amountUnit ?? ""}`}</td>
                  <td className="font-mono text-xs">{b.saltForm ?? "—"}</td>
                  <td className="num">{b.date ?? "—"}</td>
                  <td>{b.registeredBy ?? "—"}</td>
                  <td className="text-xs text-ink-muted">{b.notes ?? ""}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {writer ? <AddBatchForm registryId={c.registryId} /> : null}
      </section>

      <section className="card mt-4 p-3" aria-label="Stock solutions">
        <h2 className="mb-2 text-sm font-semibold">Stock solutions</h2>
        {c.stocks.length === 0 ? (
          <p className="text-sm text-ink-muted">No stock solution recorded yet.</p>
        ) : (
          <table className="table-dense">
            <thead>
              <tr>
                <th>From batch</th>
                <th className="text-right">Concentration (mM)</th>
                <th>Solvent</th>
                <th className="text-right">Volume (µL)</th>
                <th>Location</th>
                <th>Made on</th>
              </tr>
            </thead>
            <tbody>
              {c.stocks.map((s) => (
                <tr key={s.id}>
                  <td className="font-mono">{String(s.batchNumber).padStart(2, "0")}</td>
                  <td className="num text-right">{n(s.concentrationMm, 1)}</td>
                  <td>{s.solvent ?? "—"}</td>
                  <td className="num text-right">{n(s.volumeUl, 0)}</td>
                  <td>{s.location ?? "—"}</td>
                  <td className="num">{s.madeOn ?? "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {writer && c.batches.length > 0 ? (
          <AddStockForm registryId={c.registryId} batches={c.batches.map((b) => b.batchNumber)} />
        ) : null}
        <ChemicalSafetyNote className="mt-3" />
      </section>

      <div className="mt-4">
        <section className="card p-3" aria-label="Libraries">
          <h2 className="mb-2 text-sm font-semibold">Libraries</h2>
          {c.libraries.length === 0 ? (
            <p className="text-sm text-ink-muted">Not in any library.</p>
          ) : (
            <ul className="flex flex-wrap gap-2 text-sm">
              {c.libraries.map((l) => (
                <li key={l.id}>
                  <Link href={`/compounds/libraries/${l.id}`}>{l.name}</Link>
                </li>
              ))}
            </ul>
          )}
        </section>
      </div>

      <section className="card mt-4 p-3" aria-label="Results across campaigns">
        <h2 className="mb-2 text-sm font-semibold">Results across campaigns</h2>
        {results.length === 0 ? (
          <p className="text-sm text-ink-muted">
            No results for {c.registryId} yet in the campaigns you are a member of. Single-dose, IC50 and Ki results
            appear here once an analysis includes it.
          </p>
        ) : (
          <ResultsTable rows={results} />
        )}
        <ResearchUseNote className="mt-2" />
      </section>

      {writer ? (
        <section className="card mt-4 p-3" aria-label="Edit">
          <h2 className="mb-2 text-sm font-semibold">Edit</h2>
          <div className="grid grid-cols-1 gap-6 lg:grid-cols-2">
            <EditNamesForm registryId={c.registryId} name={c.name ?? ""} aliases={c.aliases.join("; ")} />
            <EditStructureForm registryId={c.registryId} smiles={c.smiles} />
          </div>
        </section>
      ) : null}
    </main>
  );
}
