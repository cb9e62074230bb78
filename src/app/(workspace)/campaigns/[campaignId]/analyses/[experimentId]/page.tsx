import Link from "next/link";
import { pageCampaign } from "@/server/auth/page-guard";
import { AppError } from "@/server/errors";
import { notFound } from "next/navigation";
import {
  analysisHistory,
  currentInputs,
  experimentResults,
  experimentRunList,
  getExperiment,
} from "@/server/services/analyses";
import { can } from "@/lib/roles";
import { formatConcentration, formatConcentrationRange } from "@/lib/units";
import { AnalysisRunner } from "../_components/analysis-runner";
import { RetryAnalysisButton } from "../_components/retry-analysis-button";
import { Flags, kindLabel, AnalysisStatusChip } from "../_components/labels";
import { startAnalysisAction } from "../actions";
import { formatAlpha } from "@/lib/analysis/alpha";
import { isCalledDoseResponse, isFittedDoseResponse } from "@/lib/analysis/detail";

export const metadata = { title: "Experiment" };

const pct = (x: number | null) => (x === null ? "—" : `${x.toFixed(1)} %`);
const outcomeShort = { inactive: "inactive", activator: "activator", "not-determined": "not determined" } as const;

export default async function ExperimentPage({
  params,
}: {
  params: Promise<{ campaignId: string; experimentId: string }>;
}) {
  const { campaignId, experimentId } = await params;
  const { user, role, campaign } = await pageCampaign(campaignId);
  const experiment = await getExperiment(campaignId, experimentId).catch((e) => {
    if (e instanceof AppError) notFound();
    throw e;
  });
  const [rows, runs, history, pending] = await Promise.all([
    experimentResults(experimentId),
    experimentRunList(experimentId),
    analysisHistory(experimentId, 10),
    currentInputs(campaign, experiment),
  ]);
  const current = history.find((a) => a.isCurrent) ?? null;
  const latest = history[0] ?? null;
  const upToDate = current !== null && current.inputHash === pending.hash;
  const base = `/campaigns/${campaignId}/analyses/${experimentId}`;
  return (
    <div className="flex flex-col gap-5">
      <div>
        <p className="text-xs text-ink-muted">
          <Link href={`/campaigns/${campaignId}/analyses`}>Analyses</Link> / {kindLabel[experiment.kind]}
        </p>
        <h1>{experiment.name}</h1>
      </div>
      <AnalysisRunner
        action={startAnalysisAction}
        campaignId={campaignId}
        experimentId={experimentId}
        mayRun={can(user.globalRole, role, "analysis:run")}
        latest={
          latest ? { id: latest.id, status: latest.status, progress: latest.progress, error: latest.error } : null
        }
        upToDate={upToDate}
      />
      {latest?.status === "failed" && can(user.globalRole, role, "analysis:run") ? (
        <RetryAnalysisButton campaignId={campaignId} experimentId={experimentId} analysisId={latest.id} />
      ) : null}
      <section>
        <h3 className="mb-2">
          Results{" "}
          {current
            ? `· ${rows.length} compounds · analysis of ${current.finishedAt?.toISOString().slice(0, 16).replace("T", " ")} UTC`
            : ""}
        </h3>
        {rows.length === 0 ? (
          <p className="text-sm text-ink-muted">No results yet: run the analysis.</p>
        ) : experiment.kind === "single-dose" ? (
          <table className="table-dense card">
            <thead>
              <tr>
                <th>Compound</th>
                <th className="text-right">% inhibition (mean)</th>
                <th className="text-right">SD (%)</th>
                <th className="text-right">Wells</th>
                <th>Hit</th>
                <th>Flags</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.compoundId}>
                  <td className="font-medium">{r.compoundId}</td>
                  <td className="num text-right">{pct(r.pctInhibition)}</td>
                  <td className="num text-right">{r.pctInhibitionSd === null ? "—" : r.pctInhibitionSd.toFixed(1)}</td>
                  <td className="num text-right">{r.nPoints}</td>
                  <td>
                    {r.hit ? (
                      <span className="chip bg-accent-soft text-accent-strong">hit</span>
                    ) : (
                      <span className="text-ink-faint">no</span>
                    )}
                  </td>
                  <td>
                    <Flags flags={r.flags} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : experiment.kind === "dose-response" ? (
          <table className="table-dense card">
            <thead>
              <tr>
                <th>Compound</th>
                <th className="text-right">IC50</th>
                <th className="text-right">95 % CI</th>
                <th className="text-right">Hill slope</th>
                <th className="text-right">Top (%)</th>
                <th className="text-right">Bottom (%)</th>
                <th className="text-right">Points</th>
                <th>Flags</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => {
                const fit = isFittedDoseResponse(r.detail) ? r.detail.fit : undefined;
                return (
                  <tr key={r.compoundId}>
                    <td className="whitespace-nowrap">
                      <Link href={`${base}/${r.compoundId}`}>{r.compoundId}</Link>
                    </td>
                    <td className="num text-right font-medium">
                      {isCalledDoseResponse(r.detail) ? (
                        <span className="font-normal text-warn" title={r.detail.reason}>
                          {outcomeShort[r.detail.outcome]}
                          {r.detail.maxInhibitionPct !== null ? ` (max ${r.detail.maxInhibitionPct.toFixed(0)} %)` : ""}
                          {r.ic50Um !== null ? ` ${r.ic50Qualifier ?? ""}${formatConcentration(r.ic50Um)}` : ""}
                        </span>
                      ) : (
                        <>
                          {r.ic50Qualifier ?? ""}
                          {formatConcentration(r.ic50Um)}
                        </>
                      )}
                    </td>
                    <td className="num whitespace-nowrap text-right text-ink-soft">
                      {formatConcentrationRange(r.ic50LoUm, r.ic50HiUm)}
                    </td>
                    <td className="num text-right">{r.hill === null ? "—" : r.hill.toFixed(2)}</td>
                    <td className="num text-right">{fit?.topPct == null ? "—" : fit.topPct.toFixed(1)}</td>
                    <td className="num text-right">{fit?.bottomPct == null ? "—" : fit.bottomPct.toFixed(1)}</td>
                    <td className="num text-right">{r.nPoints}</td>
                    <td>
                      <Flags flags={r.flags} />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        ) : (
          <table className="table-dense card">
            <thead>
              <tr>
                <th>Compound</th>
                <th>Mechanism</th>
                <th className="text-right">Ki</th>
                <th className="text-right">95 % CI</th>
                <th className="text-right">Kic</th>
                <th className="text-right">Kiu</th>
                <th className="text-right">α = Kiu/Kic</th>
                <th className="text-right">Points</th>
                <th>Flags</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.compoundId}>
                  <td className="whitespace-nowrap">
                    <Link href={`${base}/${r.compoundId}`}>{r.compoundId}</Link>
                  </td>
                  <td>
                    {r.override ? (
                      <span title={`Override: ${r.override.reason}`}>
                        {r.override.model} <span className="chip bg-info-soft text-info">override</span>
                      </span>
                    ) : (
                      <>
                        {r.mechanism ?? "—"}{" "}
                        {r.mechanismLabel === "ambiguous" ? (
                          <span className="chip bg-warn-soft text-warn">ambiguous</span>
                        ) : r.mechanismLabel === "inadequate" ? (
                          <span className="chip bg-fail-soft text-fail">inadequate</span>
                        ) : null}
                      </>
                    )}
                  </td>
                  <td className="num text-right font-medium">{formatConcentration(r.kiUm)}</td>
                  <td className="num text-right text-ink-soft">{formatConcentrationRange(r.kiLoUm, r.kiHiUm)}</td>
                  <td className="num text-right">{formatConcentration(r.kicUm)}</td>
                  <td className="num text-right">{formatConcentration(r.kiuUm)}</td>
                  <td className="num text-right">{formatAlpha(r.alpha, r.mechanism)}</td>
                  <td className="num text-right">{r.nPoints}</td>
                  <td>
                    <Flags flags={r.flags} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="grid gap-4 md:grid-cols-2">
        <div>
          <h3 className="mb-2">Plate runs ({runs.length})</h3>
          <table className="table-dense card">
            <thead>
              <tr>
                <th>File</th>
                <th>Decision</th>
                <th className="text-right">Z′</th>
                <th>SHA-256</th>
              </tr>
            </thead>
            <tbody>
              {runs.map((r) => (
                <tr key={r.id}>
                  <td>
                    <Link href={`/campaigns/${campaignId}/plates/runs/${r.id}`}>{r.fileName}</Link>
                  </td>
                  <td className={r.decision === "accepted" ? "" : "text-ink-muted"}>
                    {r.decision === "accepted" ? "accepted" : `${r.decision} (not used)`}
                  </td>
                  <td className="num text-right">{r.zPrime === null ? "—" : r.zPrime.toFixed(2)}</td>
                  <td className="font-mono text-2xs text-ink-muted" title={r.sha256}>
                    {r.sha256.slice(0, 12)}…
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <div>
          <h3 className="mb-2">Analysis history (provenance)</h3>
          <table className="table-dense card">
            <thead>
              <tr>
                <th>Requested (UTC)</th>
                <th>Status</th>
                <th>Engine</th>
                <th className="text-right">Runs</th>
                <th className="text-right">Masks</th>
                <th>Input hash</th>
              </tr>
            </thead>
            <tbody>
              {history.map((a) => (
                <tr key={a.id}>
                  <td className="num">{a.requestedAt.toISOString().slice(0, 16).replace("T", " ")}</td>
                  <td>
                    <AnalysisStatusChip status={a.status} progress={a.progress} />{" "}
                    {a.isCurrent ? <span className="chip bg-accent-soft text-accent-strong">current</span> : null}
                  </td>
                  <td className="text-2xs">{a.engineVersion}</td>
                  <td className="num text-right">{a.inputs.runs.length}</td>
                  <td className="num text-right" title={a.inputs.masks.map((m) => `${m.well}: ${m.reason}`).join("\n")}>
                    {a.inputs.masks.length}
                  </td>
                  <td className="font-mono text-2xs text-ink-muted" title={a.inputHash}>
                    {a.inputHash.slice(0, 12)}…
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>
    </div>
  );
}
