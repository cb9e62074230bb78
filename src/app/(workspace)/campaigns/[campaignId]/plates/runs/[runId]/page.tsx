import { apiPaths } from "@/hooks/api-paths";
import Link from "next/link";
import { notFound } from "next/navigation";
import { pageCampaign } from "@/server/auth/page-guard";
import { getRunDetail } from "@/server/services/plates";
import { AppError } from "@/server/errors";
import { can } from "@/lib/roles";
import { plateDimensions } from "@/lib/plates/geometry";
import { DecisionChip, VerdictChip, fmtDate } from "../../_components/status";
import { QcPanel } from "../../_components/qc-panel";
import { RunView, type RunWell } from "../../_components/run-view";
import { DecisionForm } from "../../_components/decision-form";

export const metadata = { title: "Plate run" };

export default async function RunPage({ params }: { params: Promise<{ campaignId: string; runId: string }> }) {
  const { campaignId, runId } = await params;
  const { user, role } = await pageCampaign(campaignId);
  if (!/^[0-9a-f-]{36}$/i.test(runId)) notFound();
  const d = await getRunDetail(campaignId, runId).catch((e: unknown) => {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  });
  const r = d.run;
  const writer = can(user.globalRole, role, "plate:write");
  const dims = plateDimensions(r.format);
  const wells: RunWell[] = d.readings.map((w) => ({
    index: w.wellIndex,
    well: w.well,
    role: w.role,
    compound: w.compoundId,
    concentrationUm: w.concentrationUm,
    substrateUm: w.substrateUm,
    value: w.value,
    rate: w.rateSignalPerS,
    rSquared: w.rateRSquared,
    linear: w.rateLinear,
    windowS: w.rateWindowStartS !== null && w.rateWindowEndS !== null ? [w.rateWindowStartS, w.rateWindowEndS] : null,
    series: w.series,
    signal: w.signal,
    inhibitionPct: w.inhibitionPct,
    masked: w.masked,
  }));
  const openMasks = Object.fromEntries(d.masks.filter((m) => !m.unmaskedAt).map((m) => [m.well, m.reason]));
  const base = `/campaigns/${campaignId}/plates`;
  return (
    <div className="flex flex-col gap-4">
      <div>
        <p className="text-xs text-ink-muted">
          <Link href={base}>Plates</Link> / plate run
        </p>
        <div className="flex flex-wrap items-center gap-2">
          <h1 className="break-all">{r.fileName}</h1>
          <VerdictChip verdict={r.qcVerdict} />
          <DecisionChip decision={r.decision} />
        </div>
        <p className="text-sm text-ink-muted">
          Plate map <Link href={`${base}/maps/${r.plateMapId}`}>{d.plateMapName}</Link> · {r.format}-well ·{" "}
          {r.readout === "kinetic" ? `kinetic, ${r.reads} reads (initial rates)` : "endpoint, 1 read"} · {r.wellCount}{" "}
          wells read{r.barcode ? ` · barcode ${r.barcode}` : ""} · uploaded {fmtDate(r.uploadedAt)} UTC by{" "}
          {d.uploadedByName ?? "—"}
        </p>
      </div>

      <section className="card flex flex-wrap items-center gap-x-6 gap-y-1 px-3 py-2 text-sm">
        <span>
          <span className="text-ink-muted">Raw file</span>{" "}
          <a href={apiPaths.plateRunFile(campaignId, r.id)} download>
            Download {r.fileName}
          </a>{" "}
          <span className="num text-ink-muted">({(r.sizeBytes / 1024).toFixed(1)} KB)</span>
        </span>
        <span className="min-w-0">
          <span className="text-ink-muted">SHA-256</span>{" "}
          <code className="break-all font-mono text-2xs text-ink-soft">{r.sha256}</code>
        </span>
        <span className="text-ink-muted">
          Detected: {r.shape.replace("-", " table, ").replace("grid table", "plate grid")}
        </span>
      </section>

      <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_20rem]">
        <RunView
          campaignId={campaignId}
          runId={r.id}
          rows={dims.rows}
          columns={dims.columns}
          readout={r.readout === "kinetic" ? "kinetic" : "endpoint"}
          wells={wells}
          openMasks={openMasks}
          canWrite={writer}
        />
        <div className="flex flex-col gap-4">
          <QcPanel qc={r.qc} />
          <section className="card px-3 py-2">
            <h3 className="mb-1">Decision</h3>
            {r.decision === "pending" ? (
              <p className="text-sm text-ink-muted">Awaiting review by an assay scientist.</p>
            ) : (
              <p className="text-sm">
                <DecisionChip decision={r.decision} /> by {d.decidedByName ?? "—"} on{" "}
                {r.decidedAt ? fmtDate(r.decidedAt) : "—"} UTC: “{r.decisionReason}”
              </p>
            )}
            {writer ? (
              <DecisionForm
                campaignId={campaignId}
                runId={r.id}
                canAccept={r.qcVerdict === "pass"}
                current={r.decision}
              />
            ) : null}
          </section>
        </div>
      </div>

      <section>
        <h3 className="mb-2">Masked wells: history ({d.masks.length})</h3>
        {d.masks.length === 0 ? (
          <p className="text-sm text-ink-muted">No well of this run has been masked.</p>
        ) : (
          <div className="card overflow-x-auto">
            <table className="table-dense">
              <thead>
                <tr>
                  <th>Well</th>
                  <th>Reason</th>
                  <th>Masked by</th>
                  <th>Masked (UTC)</th>
                  <th>Unmasked by</th>
                  <th>Unmasked (UTC)</th>
                  <th>Reason to unmask</th>
                </tr>
              </thead>
              <tbody>
                {d.masks.map((m) => (
                  <tr key={m.id}>
                    <td className="font-mono">{m.well}</td>
                    <td>{m.reason}</td>
                    <td className="text-ink-soft">{m.maskedBy ?? "—"}</td>
                    <td className="num text-ink-muted">{fmtDate(m.maskedAt)}</td>
                    <td className="text-ink-soft">{m.unmaskedBy ?? (m.unmaskedAt ? "—" : "still masked")}</td>
                    <td className="num text-ink-muted">{m.unmaskedAt ? fmtDate(m.unmaskedAt) : ""}</td>
                    <td>{m.unmaskReason ?? ""}</td>
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
