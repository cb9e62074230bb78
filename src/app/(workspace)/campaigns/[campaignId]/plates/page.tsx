import Link from "next/link";
import { pageCampaign } from "@/server/auth/page-guard";
import { EmptyState } from "@/components/ui/empty-state";
import { listPlateMaps, listRuns } from "@/server/services/plates";
import { can } from "@/lib/roles";
import { ZPrimeTrend } from "@/components/plots/z-prime-trend";
import { DecisionChip, VerdictChip, fmtDate, fmtNum } from "./_components/status";
import { listBatches } from "@/server/services/plates/batches";
import { BatchUpload } from "./_components/batch-upload";

export const metadata = { title: "Plates" };

export default async function PlatesPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  const { user, role, campaign } = await pageCampaign(campaignId);
  const writer = can(user.globalRole, role, "plate:write");
  const [maps, runs, batches] = await Promise.all([
    listPlateMaps(campaignId),
    listRuns(campaignId),
    listBatches(campaignId),
  ]);
  const base = `/campaigns/${campaignId}/plates`;
  const passed = runs.filter((r) => r.qcVerdict === "pass").length;
  const accepted = runs.filter((r) => r.decision === "accepted").length;
  const trend = [...runs]
    .sort((a, b) => a.uploadedAt.getTime() - b.uploadedAt.getTime() || a.fileName.localeCompare(b.fileName))
    .map((r) => ({
      id: r.id,
      label: r.barcode ?? r.fileName,
      at: r.uploadedAt.toISOString(),
      zPrime: r.zPrime,
      verdict: r.qcVerdict,
      decision: r.decision,
    }));
  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Plates</h1>
          <p className="text-sm text-ink-muted">
            {runs.length} plate runs · {passed} pass QC · {accepted} accepted · {maps.length} plate maps · QC: Z′ ≥{" "}
            <span className="num">{campaign.qcMinZPrime}</span>, control CV ≤{" "}
            <span className="num">{campaign.qcMaxCvPct}</span> %
          </p>
        </div>
        {writer ? (
          <div className="flex gap-2">
            <Link className="btn-quiet" href={`${base}/maps/new`}>
              New plate map
            </Link>
            <Link className="btn-primary" href={`${base}/upload`}>
              Upload reader exports
            </Link>
          </div>
        ) : null}
      </div>

      {writer && maps.length > 0 ? (
        <BatchUpload campaignId={campaignId} maps={maps.map((m) => ({ id: m.id, name: m.name }))} />
      ) : null}
      {batches.length > 0 ? (
        <section>
          <h3 className="mb-1">Recent batches</h3>
          <ul className="flex flex-col gap-0.5 text-sm">
            {batches.map((b) => (
              <li key={b.id}>
                <Link href={`${base}/batches/${b.id}`}>{b.label}</Link>{" "}
                <span className="text-2xs text-ink-muted">
                  {fmtDate(b.createdAt)} UTC · {b.stored} of {b.fileCount} files stored
                </span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {runs.length === 0 ? (
        <EmptyState title="No plate runs yet.">
          Reader exports uploaded against a plate map are stored, checksummed, parsed and checked (Z′, S/B, control CV)
          before their numbers count.
        </EmptyState>
      ) : (
        <>
          <section className="card px-3 py-2">
            <h3 className="mb-1">Z′ over time</h3>
            <ZPrimeTrend points={trend} minZPrime={campaign.qcMinZPrime} runHref={`${base}/runs`} />
          </section>
          <section>
            <h3 className="mb-2">Plate runs ({runs.length})</h3>
            <div className="card overflow-x-auto">
              <table className="table-dense">
                <thead>
                  <tr>
                    <th>File / barcode</th>
                    <th>Plate map</th>
                    <th>Readout</th>
                    <th className="text-right">Wells</th>
                    <th className="text-right">Reads</th>
                    <th className="text-right">Z′</th>
                    <th className="text-right">CV neutral (%)</th>
                    <th className="text-right">CV full (%)</th>
                    <th>QC</th>
                    <th>Decision</th>
                    <th>Uploaded (UTC)</th>
                  </tr>
                </thead>
                <tbody>
                  {runs.map((r) => (
                    <tr key={r.id}>
                      <td className="whitespace-nowrap">
                        <Link href={`${base}/runs/${r.id}`}>{r.fileName}</Link>
                        {r.barcode ? <span className="ml-1 text-2xs text-ink-muted">{r.barcode}</span> : null}
                      </td>
                      <td className="text-ink-soft">{r.plateMapName}</td>
                      <td className="text-ink-soft">{r.readout}</td>
                      <td className="num text-right">{r.wellCount}</td>
                      <td className="num text-right">{r.reads}</td>
                      <td className="num text-right">{fmtNum(r.zPrime, 3)}</td>
                      <td className="num text-right">{fmtNum(r.qc.cvNeutralPct, 1)}</td>
                      <td
                        className={`num text-right ${r.qc.full?.cvApplies === false ? "text-ink-faint" : ""}`}
                        title={
                          r.qc.full?.cvApplies === false
                            ? "Mean within 3 SD of zero (e.g. a no-enzyme rate): the CV limit is not applied."
                            : undefined
                        }
                      >
                        {fmtNum(r.qc.cvFullPct, 1)}
                        {r.qc.full?.cvApplies === false ? "*" : ""}
                      </td>
                      <td>
                        <VerdictChip verdict={r.qcVerdict} />
                        {r.qc.edge?.flagged ? <span className="chip ml-1 bg-warn-soft text-warn">edge</span> : null}
                      </td>
                      <td>
                        <DecisionChip decision={r.decision} />
                      </td>
                      <td className="num whitespace-nowrap text-ink-muted">{fmtDate(r.uploadedAt)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
            <p className="mt-1 text-2xs text-ink-muted">
              * Mean within 3 SD of zero (e.g. the no-enzyme rate of a kinetic run): the CV limit is not applied.
            </p>
          </section>
        </>
      )}

      <section>
        <h3 className="mb-2">Plate maps ({maps.length})</h3>
        {maps.length === 0 ? (
          <p className="text-sm text-ink-muted">
            No plate maps yet.{writer ? " Start one with “New plate map”, or import a CSV there." : ""}
          </p>
        ) : (
          <div className="card overflow-x-auto">
            <table className="table-dense">
              <thead>
                <tr>
                  <th>Name</th>
                  <th className="text-right">Format (wells)</th>
                  <th className="text-right">Samples</th>
                  <th className="text-right">Neutral</th>
                  <th className="text-right">Full inhibition</th>
                  <th>Signal with inhibition</th>
                  <th className="text-right">Runs</th>
                  <th>Created by</th>
                </tr>
              </thead>
              <tbody>
                {maps.map((m) => (
                  <tr key={m.id}>
                    <td>
                      <Link href={`${base}/maps/${m.id}`}>{m.name}</Link>
                      {m.isTemplate ? <span className="chip ml-1 bg-info-soft text-info">template</span> : null}
                    </td>
                    <td className="num text-right">{m.format}</td>
                    <td className="num text-right">{m.sampleWells}</td>
                    <td className="num text-right">{m.neutralWells}</td>
                    <td className="num text-right">{m.fullWells}</td>
                    <td className="text-ink-soft">{m.signalDirection}</td>
                    <td className="num text-right">{m.runs}</td>
                    <td className="text-ink-muted">{m.createdBy ?? "—"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </div>
  );
}
