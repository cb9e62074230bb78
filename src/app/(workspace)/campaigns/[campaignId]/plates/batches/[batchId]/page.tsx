import Link from "next/link";
import { notFound } from "next/navigation";
import { pageCampaign } from "@/server/auth/page-guard";
import { listPlateMaps } from "@/server/services/plates";
import { getBatch, runSignals } from "@/server/services/plates/batches";
import { AppError } from "@/server/errors";
import { can } from "@/lib/roles";
import { isPlateFormat } from "@/lib/plates/geometry";
import { ResearchUseNote } from "@/components/ui/caution";
import { DecisionChip, VerdictChip, fmtDate, fmtNum } from "../../_components/status";
import { BatchHeatmap } from "../../_components/batch-heatmap";
import { AcceptPassingForm, AssignMap, RowDecision } from "../../_components/batch-review";

export const metadata = { title: "Plate batch" };

const OUTCOME_WORDS = {
  pending: "waiting to be parsed",
  stored: "stored",
  duplicate: "already uploaded",
  refused: "refused",
  unmatched: "no plate map",
} as const;
const OUTCOME_TONE = {
  pending: "bg-paper-sunk text-ink-muted",
  stored: "bg-info-soft text-info",
  duplicate: "bg-warn-soft text-warn",
  refused: "bg-fail-soft text-fail",
  unmatched: "bg-warn-soft text-warn",
} as const;

export default async function BatchPage({ params }: { params: Promise<{ campaignId: string; batchId: string }> }) {
  const { campaignId, batchId } = await params;
  const { user, role, campaign } = await pageCampaign(campaignId);
  const writer = can(user.globalRole, role, "plate:write");
  const batch = await getBatch(campaignId, batchId).catch((e) => {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  });
  const [signals, maps] = await Promise.all([
    runSignals(batch.files.map((f) => f.run?.id).filter((x): x is string => !!x)),
    writer ? listPlateMaps(campaignId) : Promise.resolve([]),
  ]);
  const base = `/campaigns/${campaignId}/plates`;
  const c = batch.counts;
  const eligible = batch.files.filter((f) => f.run?.verdict === "pass" && f.run.decision === "pending").length;
  return (
    <div className="flex flex-col gap-4">
      <div>
        <p className="text-2xs text-ink-muted">
          <Link href={base}>Plates</Link> / batch
        </p>
        <h1>Plate batch: {batch.label}</h1>
        <p className="text-sm text-ink-muted">
          Uploaded {fmtDate(batch.createdAt)} UTC · {c.total} files: {c.stored} stored, {c.duplicate} already uploaded,{" "}
          {c.refused} refused, {c.unmatched} without a plate map{c.pending ? `, ${c.pending} waiting` : ""} · QC:{" "}
          {c.pass} pass, {c.fail} fail (Z′ ≥ <span className="num">{campaign.qcMinZPrime}</span>, control CV ≤{" "}
          <span className="num">{campaign.qcMaxCvPct}</span> %) · {c.accepted} accepted
        </p>
        {batch.status === "interrupted" ? (
          <p role="alert" className="mt-1 text-sm text-fail">
            Processing of this batch stopped before every file was parsed (the server restarted). The files still
            waiting were stored but not parsed; upload them again.
          </p>
        ) : batch.status === "processing" ? (
          <p className="mt-1 text-sm text-ink-muted">Files are still being parsed; reload for their outcomes.</p>
        ) : null}
      </div>

      {writer ? (
        <section className="card px-3 py-2">
          <AcceptPassingForm campaignId={campaignId} batchId={batch.id} eligible={eligible} />
          <p className="mt-1 text-2xs text-ink-muted">
            Plates that fail QC are never accepted here: mask the wells at fault on the plate&apos;s page, or reject it.
          </p>
        </section>
      ) : null}

      <section className="card overflow-x-auto">
        <table className="table-dense">
          <thead>
            <tr>
              <th>File / barcode</th>
              <th>Outcome</th>
              <th>Plate map</th>
              <th>Signal map</th>
              <th className="text-right">Z′</th>
              <th className="text-right">S/B (ratio)</th>
              <th className="text-right">CV neutral (%)</th>
              <th className="text-right">CV full (%)</th>
              <th>QC</th>
              <th>Decision</th>
              {writer ? <th>Review</th> : null}
            </tr>
          </thead>
          <tbody>
            {batch.files.map((f) => (
              <tr key={f.id}>
                <td className="whitespace-nowrap">
                  {f.run ? <Link href={`${base}/runs/${f.run.id}`}>{f.fileName}</Link> : f.fileName}
                  {f.barcode ? <span className="ml-1 text-2xs text-ink-muted">{f.barcode}</span> : null}
                  <div className="font-mono text-2xs text-ink-faint" title={`SHA-256 ${f.sha256}`}>
                    {f.sha256.slice(0, 12)}… · {(f.sizeBytes / 1024).toFixed(1)} KB
                  </div>
                </td>
                <td className="max-w-[22rem]">
                  <span className={`chip ${OUTCOME_TONE[f.outcome]}`}>{OUTCOME_WORDS[f.outcome]}</span>
                  {f.outcome === "duplicate" && f.existingRunId ? (
                    <Link className="ml-1 text-2xs" href={`${base}/runs/${f.existingRunId}`}>
                      earlier run
                    </Link>
                  ) : null}
                  {f.message && f.outcome !== "stored" ? (
                    <div className="mt-0.5 text-2xs text-ink-soft">{f.message}</div>
                  ) : null}
                  {writer && (f.outcome === "unmatched" || f.outcome === "refused") && maps.length > 0 ? (
                    <div className="mt-1">
                      <AssignMap
                        campaignId={campaignId}
                        batchId={batch.id}
                        fileId={f.id}
                        maps={maps.map((m) => ({ id: m.id, name: m.name }))}
                      />
                    </div>
                  ) : null}
                </td>
                <td className="text-ink-soft">
                  {f.plateMapName ?? "—"}
                  {f.matchedBy ? <div className="text-2xs text-ink-faint">by {f.matchedBy}</div> : null}
                </td>
                <td>
                  {f.run && isPlateFormat(f.run.format) ? (
                    <BatchHeatmap format={f.run.format} values={signals.get(f.run.id) ?? []} label={f.fileName} />
                  ) : (
                    <span className="text-ink-faint">—</span>
                  )}
                </td>
                <td className="num text-right">{fmtNum(f.run?.zPrime, 3)}</td>
                <td className="num text-right">{fmtNum(f.run?.signalToBackground, 1)}</td>
                <td className="num text-right">{fmtNum(f.run?.cvNeutralPct, 1)}</td>
                <td className="num text-right">{fmtNum(f.run?.cvFullPct, 1)}</td>
                <td>
                  {f.run ? <VerdictChip verdict={f.run.verdict} /> : <span className="text-ink-faint">—</span>}
                  {f.run?.verdict === "fail" && f.run.reasons[0] ? (
                    <div className="max-w-[16rem] text-2xs text-ink-soft">{f.run.reasons[0]}</div>
                  ) : null}
                </td>
                <td>
                  {f.run ? (
                    <DecisionChip decision={f.run.decision as "pending" | "accepted" | "rejected"} />
                  ) : (
                    <span className="text-ink-faint">—</span>
                  )}
                </td>
                {writer ? (
                  <td>
                    {f.run ? (
                      <RowDecision campaignId={campaignId} runId={f.run.id} canAccept={f.run.verdict === "pass"} />
                    ) : null}
                  </td>
                ) : null}
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <p className="text-2xs text-ink-muted">
        Signal map: each well&apos;s signal (endpoint value, or initial rate for kinetic reads), light = the
        plate&apos;s lowest, dark = its highest; blank wells are empty or masked. S/B is the neutral-control mean over
        the full-inhibition mean.
      </p>
      <ResearchUseNote />
    </div>
  );
}
