import { engineOptionsFrom } from "@/lib/analysis/settings";
import Link from "next/link";
import { notFound } from "next/navigation";
import { pageCampaign, pageParam } from "@/server/auth/page-guard";
import { AppError } from "@/server/errors";
import {
  analysisHistory,
  chosenModel,
  compoundResultDetail,
  currentInputs,
  experimentRunList,
  getAnalysis,
  getExperiment,
  type Analysis,
  type ExperimentResult,
} from "@/server/services/analyses";
import { compoundMaskedWells } from "@/server/services/plates";
import { can } from "@/lib/roles";
import { campaignKmUm } from "@/lib/units";
import { ResearchUseNote } from "@/components/ui/caution";
import { Flags, kindLabel } from "../../_components/labels";
import { OverrideForm, PlannerForm } from "../../_components/result-forms";
import { AnalysisRunner } from "../../_components/analysis-runner";
import { DoseResponseCuration, type DoseResponseWell } from "../../_components/dose-response-curation";
import { MechanismCuration, type MechanismWell } from "../../_components/mechanism-curation";
import {
  overrideMechanismAction,
  planMechanismPlateAction,
  saveCurationAction,
  startAnalysisAction,
} from "../../actions";

export const metadata = { title: "Compound result" };

type AnalysisInputs = Analysis["inputs"];
type Mask = AnalysisInputs["masks"][number];
const keyOf = (runId: string, well: string) => `${runId}|${well}`;

/**
 * The options the pipeline (services/analyses/run.ts) passes the engine for these inputs, so the
 * browser's preview computes what the next analysis will store.
 */
export default async function CompoundResultPage({
  params,
}: {
  params: Promise<{ campaignId: string; experimentId: string; compoundId: string }>;
}) {
  const { campaignId, experimentId, compoundId } = await params;
  const { user, role, campaign } = await pageCampaign(campaignId);
  const notFoundOnApp = (e: unknown) => {
    if (e instanceof AppError) notFound();
    throw e;
  };
  const experiment = await getExperiment(campaignId, experimentId).catch(notFoundOnApp);
  const r = await compoundResultDetail(experimentId, pageParam("compoundId", compoundId)).catch(notFoundOnApp);
  const [current, pending, runs, history] = await Promise.all([
    getAnalysis(campaignId, r.analysisId).catch(notFoundOnApp),
    currentInputs(campaign, experiment),
    experimentRunList(experimentId),
    analysisHistory(experimentId, 1),
  ]);
  const base = `/campaigns/${campaignId}/analyses/${experimentId}`;
  const kmUm = campaignKmUm(campaign);
  const mayEdit = can(user.globalRole, role, "plate:write");
  const runLabel = new Map(runs.map((x) => [x.id, x.fileName]));
  // Wells left out by the stored analysis, and wells masked now (what the next analysis leaves out).
  const analysisMasks = new Map(current.inputs.masks.map((m) => [keyOf(m.runId, m.well), m]));
  const openMasks = new Map(pending.inputs.masks.map((m) => [keyOf(m.runId, m.well), m]));
  const union: Mask[] = [...new Map([...analysisMasks, ...openMasks]).values()];
  const maskedRows = r.kind === "single-dose" ? [] : await compoundMaskedWells(union, r.compoundId);
  const well = (runId: string, w: string, inAnalysis: boolean) => {
    const key = keyOf(runId, w);
    return {
      key,
      runId,
      well: w,
      runLabel: runLabel.get(runId) ?? runId.slice(0, 8),
      inAnalysis,
      savedMasked: openMasks.has(key),
      reason: openMasks.get(key)?.reason ?? analysisMasks.get(key)?.reason ?? null,
    };
  };
  const options = engineOptionsFrom(pending.inputs.settings);
  const latest = history[0] ?? null;
  const upToDate = current.inputHash === pending.hash;
  const outOfDate = !upToDate || (latest !== null && latest.status !== "done" && latest.status !== "failed");

  return (
    <div className="flex flex-col gap-5">
      <div>
        <p className="text-xs text-ink-muted">
          <Link href={`/campaigns/${campaignId}/analyses`}>Analyses</Link> / <Link href={base}>{experiment.name}</Link>{" "}
          / {kindLabel[experiment.kind]}
        </p>
        <h1>{r.compoundId}</h1>
        {r.flags.length ? (
          <div className="mt-1">
            <Flags flags={r.flags} />
          </div>
        ) : null}
        <ResearchUseNote className="mt-1" />
      </div>
      {outOfDate ? (
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
      ) : null}
      {r.kind === "dose-response" ? (
        <DoseResponseCuration
          campaignId={campaignId}
          experimentId={experimentId}
          compoundId={r.compoundId}
          wells={doseResponseWells(r, maskedRows, well)}
          stored={{
            ic50Um: r.ic50Um,
            ic50LoUm: r.ic50LoUm,
            ic50HiUm: r.ic50HiUm,
            ic50Qualifier: r.ic50Qualifier === ">" || r.ic50Qualifier === "<" ? r.ic50Qualifier : null,
            hill: r.hill,
            nPoints: r.nPoints,
            flags: r.flags,
            detail: r.detail,
          }}
          options={options.doseResponse}
          mayEdit={mayEdit}
          action={saveCurationAction}
        />
      ) : null}
      {r.kind === "mechanism" ? (
        <MechanismCuration
          campaignId={campaignId}
          experimentId={experimentId}
          compoundId={r.compoundId}
          wells={mechanismWells(r, maskedRows, well)}
          stored={{ detail: r.detail, chosen: chosenModel(r), flags: r.flags }}
          override={r.override ? { model: r.override.model, reason: r.override.reason } : null}
          options={options.mechanism}
          mayEdit={mayEdit}
          action={saveCurationAction}
        />
      ) : null}
      {r.kind === "mechanism" && can(user.globalRole, role, "analysis:override") ? (
        <section>
          <h3 className="mb-2">Override the model choice</h3>
          <OverrideForm
            action={overrideMechanismAction}
            campaignId={campaignId}
            experimentId={experimentId}
            compoundId={r.compoundId}
            current={r.override?.model ?? r.mechanism ?? "competitive"}
          />
        </section>
      ) : null}
      {r.kind === "dose-response" && r.ic50Um && !r.ic50Qualifier && can(user.globalRole, role, "plate:write") ? (
        <section>
          <h3 className="mb-2">Plan a mechanism study</h3>
          <PlannerForm
            action={planMechanismPlateAction}
            campaignId={campaignId}
            compoundId={r.compoundId}
            ic50Um={r.ic50Um}
            kmUm={kmUm}
            assaySubstrateUm={(experiment.settings.substrateUm ?? kmUm) || null}
          />
        </section>
      ) : null}
      <p className="text-2xs text-ink-muted" data-testid="provenance">
        Analysis {r.analysisId.slice(0, 8)} · engine {current.engineVersion} · input hash{" "}
        <span className="font-mono" data-testid="input-hash" title={current.inputHash}>
          {current.inputHash.slice(0, 16)}…
        </span>{" "}
        · {current.inputs.runs.length} accepted runs ·{" "}
        <span data-testid="masked-count">{current.inputs.masks.length}</span> masked wells
        {runs.length ? (
          <>
            {" "}
            · runs:{" "}
            {runs.map((x, k) => (
              <span key={x.id}>
                {k ? ", " : ""}
                <Link href={`/campaigns/${campaignId}/plates/runs/${x.id}`}>{x.fileName}</Link>
              </span>
            ))}{" "}
            (mask history on each run&rsquo;s page)
          </>
        ) : null}
      </p>
    </div>
  );
}

type WellOf = (
  runId: string,
  well: string,
  inAnalysis: boolean,
) => Omit<DoseResponseWell, "concentrationUm" | "inhibitionPct">;
type Result<K extends ExperimentResult["kind"]> = Extract<ExperimentResult, { kind: K }>;

/** The wells of a dose-response result: those in the stored fit and the masked ones. */
function doseResponseWells(
  r: Result<"dose-response">,
  masked: Awaited<ReturnType<typeof compoundMaskedWells>>,
  well: WellOf,
): DoseResponseWell[] {
  const inFit = r.detail.points.map(([x, y, runId, w]) => ({
    ...well(runId, w, true),
    concentrationUm: x,
    inhibitionPct: y,
  }));
  const seen = new Set(inFit.map((w) => w.key));
  const out = masked.flatMap((m) =>
    m.concentrationUm === null || m.inhibitionPct === null || seen.has(keyOf(m.runId, m.well))
      ? []
      : [{ ...well(m.runId, m.well, false), concentrationUm: m.concentrationUm, inhibitionPct: m.inhibitionPct }],
  );
  return [...inFit, ...out];
}

/** The wells of a mechanism result: those in the stored fit and the masked ones. */
function mechanismWells(
  r: Result<"mechanism">,
  masked: Awaited<ReturnType<typeof compoundMaskedWells>>,
  well: WellOf,
): MechanismWell[] {
  const d = r.detail;
  const inFit: MechanismWell[] =
    "models" in d
      ? d.points.flatMap(([s, i, v, runId, w]) =>
          v === null ? [] : [{ ...well(runId, w, true), substrateUm: s, inhibitorUm: i, rate: v }],
        )
      : d.points.map((p) => ({
          ...well(p.runId, p.well, true),
          substrateUm: p.substrate,
          inhibitorUm: p.inhibitor,
          rate: p.rate,
        }));
  const seen = new Set(inFit.map((w) => w.key));
  const out = masked.flatMap((m) =>
    m.substrateUm === null || m.rate === null || seen.has(keyOf(m.runId, m.well))
      ? []
      : [
          {
            ...well(m.runId, m.well, false),
            substrateUm: m.substrateUm,
            inhibitorUm: m.concentrationUm ?? 0,
            rate: m.rate,
          },
        ],
  );
  return [...inFit, ...out];
}
