import "server-only";
import crypto from "node:crypto";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import {
  analyses,
  compoundResults,
  experimentRuns,
  experiments,
  mechanismOverrides,
  plateRuns,
  plateWellMasks,
  wellReadings,
  campaigns,
  type AnalysisInputs,
  type ExperimentSettings,
} from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { SessionUser } from "@/server/auth/session";
import { audit } from "./audit";
import { refreshHitRows } from "./hits";
import { ENGINE_VERSION, ic50FromKi, type HitRule, type InhibitionModel } from "@/lib/kinetics";
import {
  analyseDoseResponse,
  analyseMechanism,
  analyseSingleDose,
  type AnalysisReading,
  type CompoundResult,
} from "@/lib/analysis/compute";
import { toMicromolar, toNanomolar } from "@/lib/units";

type Actor = Pick<SessionUser, "id" | "email">;
type Campaign = typeof campaigns.$inferSelect;
export type ExperimentKind = "single-dose" | "dose-response" | "mechanism";

/** Cheng–Prusoff cross-check: predicted and measured IC50 further apart than this are flagged (common practice). */
export const CHENG_PRUSOFF_TOLERANCE = 3;

// ---------------------------------------------------------------- experiments

export async function createExperiment(
  actor: Actor,
  campaign: Campaign,
  input: { name: string; kind: ExperimentKind; runIds: string[]; settings?: ExperimentSettings },
): Promise<{ id: string }> {
  const runIds = [...new Set(input.runIds)];
  if (runIds.length === 0) throw new AppError("bad_request", "Choose at least one plate run.");
  const runs = await db
    .select({ id: plateRuns.id })
    .from(plateRuns)
    .where(and(eq(plateRuns.campaignId, campaign.id), inArray(plateRuns.id, runIds)));
  const known = new Set(runs.map((r) => r.id));
  const missing = runIds.filter((id) => !known.has(id));
  if (missing.length)
    throw new AppError("bad_request", `These plate runs are not in this campaign: ${missing.join(", ")}`);
  return db.transaction(async (tx) => {
    const [e] = await tx
      .insert(experiments)
      .values({
        campaignId: campaign.id,
        name: input.name,
        kind: input.kind,
        settings: input.settings ?? {},
        createdBy: actor.id,
      })
      .returning({ id: experiments.id });
    await tx.insert(experimentRuns).values(runIds.map((runId) => ({ experimentId: e!.id, runId })));
    await audit(tx, actor, {
      campaignId: campaign.id,
      action: "experiment.create",
      entityType: "experiment",
      entityId: e!.id,
      after: { ...input, runIds },
    });
    return { id: e!.id };
  });
}

export async function getExperiment(campaignId: string, experimentId: string) {
  if (!/^[0-9a-f-]{36}$/i.test(experimentId)) throw new AppError("not_found", "No such experiment.");
  const e = await db.query.experiments.findFirst({
    where: and(eq(experiments.id, experimentId), eq(experiments.campaignId, campaignId)),
  });
  if (!e) throw new AppError("not_found", "No such experiment.");
  return e;
}

export async function listExperiments(campaignId: string) {
  const rows = await db
    .select({
      experiment: experiments,
      runs: sql<number>`(select count(*)::int from experiment_runs er where er.experiment_id = ${experiments.id})`,
      acceptedRuns: sql<number>`(select count(*)::int from experiment_runs er join plate_runs pr on pr.id = er.run_id where er.experiment_id = ${experiments.id} and pr.decision = 'accepted')`,
    })
    .from(experiments)
    .where(eq(experiments.campaignId, campaignId))
    .orderBy(desc(experiments.createdAt));
  const latest = rows.length
    ? await db
        .selectDistinctOn([analyses.experimentId])
        .from(analyses)
        .where(
          inArray(
            analyses.experimentId,
            rows.map((r) => r.experiment.id),
          ),
        )
        .orderBy(analyses.experimentId, desc(analyses.requestedAt))
    : [];
  const current = rows.length
    ? await db
        .select()
        .from(analyses)
        .where(
          and(
            inArray(
              analyses.experimentId,
              rows.map((r) => r.experiment.id),
            ),
            eq(analyses.isCurrent, true),
          ),
        )
    : [];
  return rows.map((r) => ({
    ...r,
    latest: latest.find((a) => a.experimentId === r.experiment.id) ?? null,
    current: current.find((a) => a.experimentId === r.experiment.id) ?? null,
  }));
}

export async function experimentRunList(experimentId: string) {
  return db
    .select({
      id: plateRuns.id,
      fileName: plateRuns.fileName,
      barcode: plateRuns.barcode,
      decision: plateRuns.decision,
      qcVerdict: plateRuns.qcVerdict,
      zPrime: plateRuns.zPrime,
      sha256: plateRuns.sha256,
    })
    .from(experimentRuns)
    .innerJoin(plateRuns, eq(plateRuns.id, experimentRuns.runId))
    .where(eq(experimentRuns.experimentId, experimentId))
    .orderBy(asc(plateRuns.fileName));
}

// ---------------------------------------------------------------- inputs and provenance

function resolvedSettings(campaign: Campaign, s: ExperimentSettings) {
  const campaignKmUm = campaign.kmValue !== null ? toMicromolar(campaign.kmValue, campaign.kmUnit ?? "µM") : null;
  const campaignENm =
    campaign.enzymeConcValue !== null ? toNanomolar(campaign.enzymeConcValue, campaign.enzymeConcUnit ?? "nM") : null;
  return {
    hitThresholdPct: s.hitRule?.kind === "threshold" ? s.hitRule.thresholdPct : campaign.hitThresholdPct,
    kmUm: s.kmUm ?? campaignKmUm,
    enzymeNm: s.enzymeNm ?? campaignENm,
  };
}

/** Canonical JSON (sorted keys) so the same inputs always hash the same. */
function canonical(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonical).join(",")}]`;
  if (v && typeof v === "object") {
    return `{${Object.keys(v as object)
      .sort()
      .filter((k) => (v as Record<string, unknown>)[k] !== undefined)
      .map((k) => `${JSON.stringify(k)}:${canonical((v as Record<string, unknown>)[k])}`)
      .join(",")}}`;
  }
  return JSON.stringify(v ?? null);
}

/** What an analysis of this experiment would be computed from right now. Only accepted runs count. */
export async function currentInputs(
  campaign: Campaign,
  experiment: typeof experiments.$inferSelect,
): Promise<{ inputs: AnalysisInputs; hash: string }> {
  const runs = await db
    .select({ id: plateRuns.id, sha256: plateRuns.sha256, fileName: plateRuns.fileName, decision: plateRuns.decision })
    .from(experimentRuns)
    .innerJoin(plateRuns, eq(plateRuns.id, experimentRuns.runId))
    .where(and(eq(experimentRuns.experimentId, experiment.id), eq(plateRuns.decision, "accepted")))
    .orderBy(asc(plateRuns.id));
  const masks = runs.length
    ? await db
        .select({ runId: plateWellMasks.runId, well: plateWellMasks.well, reason: plateWellMasks.reason })
        .from(plateWellMasks)
        .where(
          and(
            inArray(
              plateWellMasks.runId,
              runs.map((r) => r.id),
            ),
            sql`${plateWellMasks.unmaskedAt} is null`,
          ),
        )
        .orderBy(asc(plateWellMasks.runId), asc(plateWellMasks.well))
    : [];
  const inputs: AnalysisInputs = {
    engineVersion: ENGINE_VERSION,
    kind: experiment.kind,
    settings: { ...experiment.settings, resolved: resolvedSettings(campaign, experiment.settings) },
    runs,
    masks,
  };
  const hash = crypto.createHash("sha256").update(canonical(inputs)).digest("hex");
  return { inputs, hash };
}

/**
 * Asks for an analysis. The same inputs as the current (or a queued/running) analysis give that
 * analysis back: no new rows, identical numbers. Otherwise a queued analysis is created; the
 * worker (or `runAnalysis` directly) computes it.
 */
export async function requestAnalysis(
  actor: Actor,
  campaign: Campaign,
  experimentId: string,
): Promise<{ id: string; status: string; reused: boolean }> {
  const experiment = await getExperiment(campaign.id, experimentId);
  const { inputs, hash } = await currentInputs(campaign, experiment);
  if (inputs.runs.length === 0)
    throw new AppError("bad_request", "No accepted plate run in this experiment: accept runs that pass QC first.");
  return db.transaction(async (tx) => {
    // Serialise requests for one experiment so two clicks cannot queue the same work twice.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${experiment.id}))`);
    const [same] = await tx
      .select()
      .from(analyses)
      .where(
        and(
          eq(analyses.experimentId, experiment.id),
          eq(analyses.inputHash, hash),
          sql`(${analyses.isCurrent} or ${analyses.status} in ('queued','running'))`,
        ),
      )
      .orderBy(desc(analyses.requestedAt))
      .limit(1);
    if (same) return { id: same.id, status: same.status, reused: true };
    const [a] = await tx
      .insert(analyses)
      .values({
        experimentId: experiment.id,
        campaignId: campaign.id,
        engineVersion: ENGINE_VERSION,
        inputHash: hash,
        inputs,
        requestedBy: actor.id,
      })
      .returning({ id: analyses.id, status: analyses.status });
    await audit(tx, actor, {
      campaignId: campaign.id,
      action: "analysis.request",
      entityType: "analysis",
      entityId: a!.id,
      after: { experimentId, inputHash: hash },
    });
    return { id: a!.id, status: a!.status, reused: false };
  });
}

export async function getAnalysis(campaignId: string, analysisId: string) {
  if (!/^[0-9a-f-]{36}$/i.test(analysisId)) throw new AppError("not_found", "No such analysis.");
  const a = await db.query.analyses.findFirst({
    where: and(eq(analyses.id, analysisId), eq(analyses.campaignId, campaignId)),
  });
  if (!a) throw new AppError("not_found", "No such analysis.");
  return a;
}

// ---------------------------------------------------------------- the computation

type Progress = (fraction: number) => Promise<void> | void;

async function loadReadings(inputs: AnalysisInputs): Promise<AnalysisReading[]> {
  if (inputs.runs.length === 0) return [];
  const rows = await db
    .select({
      runId: wellReadings.runId,
      well: wellReadings.well,
      role: wellReadings.role,
      compoundId: wellReadings.compoundId,
      concentrationUm: wellReadings.concentrationUm,
      substrateUm: wellReadings.substrateUm,
      signal: wellReadings.signal,
      inhibitionPct: wellReadings.inhibitionPct,
      masked: wellReadings.masked,
    })
    .from(wellReadings)
    .where(
      inArray(
        wellReadings.runId,
        inputs.runs.map((r) => r.id),
      ),
    );
  // The masks recorded in the inputs decide, so a mask changed after the request cannot leak in.
  const masked = new Set(inputs.masks.map((m) => `${m.runId}|${m.well}`));
  return rows.map((r) => ({ ...r, masked: masked.has(`${r.runId}|${r.well}`) }));
}

function hitRuleOf(inputs: AnalysisInputs): HitRule {
  const r = inputs.settings.hitRule;
  if (r?.kind === "sd") return { kind: "sd", k: r.k };
  if (r?.kind === "robust") return { kind: "robust", k: r.k };
  return { kind: "percent", thresholdPercent: inputs.settings.resolved.hitThresholdPct };
}

/** The measured IC50 (current dose-response analyses of the campaign) of each compound, µM. */
async function measuredIc50s(campaignId: string, compoundIds: string[]) {
  if (compoundIds.length === 0)
    return new Map<string, { ic50Um: number; substrateUm: number | null; experimentId: string }>();
  const rows = await db
    .select({
      compoundId: compoundResults.compoundId,
      ic50Um: compoundResults.ic50Um,
      qualifier: compoundResults.ic50Qualifier,
      settings: experiments.settings,
      experimentId: experiments.id,
    })
    .from(compoundResults)
    .innerJoin(analyses, eq(analyses.id, compoundResults.analysisId))
    .innerJoin(experiments, eq(experiments.id, compoundResults.experimentId))
    .where(
      and(
        eq(compoundResults.campaignId, campaignId),
        eq(analyses.isCurrent, true),
        eq(compoundResults.kind, "dose-response"),
        inArray(compoundResults.compoundId, compoundIds),
      ),
    );
  const m = new Map<string, { ic50Um: number; substrateUm: number | null; experimentId: string }>();
  for (const r of rows)
    if (r.ic50Um !== null && !r.qualifier)
      m.set(r.compoundId, {
        ic50Um: r.ic50Um,
        substrateUm: r.settings.substrateUm ?? null,
        experimentId: r.experimentId,
      });
  return m;
}

/** Cheng–Prusoff: the IC50 the fitted mechanism predicts at the dose-response assay's [S], against the measured one. */
function chengPrusoffCheck(
  r: CompoundResult,
  measured: { ic50Um: number; substrateUm: number | null; experimentId: string } | undefined,
  kmUm: number | null,
) {
  if (!measured || !r.mechanism) return null;
  if (measured.substrateUm === null || measured.substrateUm === undefined || kmUm === null) {
    return {
      measuredIc50Um: measured.ic50Um,
      note: "substrate concentration of the dose-response assay or Km not set: no prediction",
    };
  }
  const predicted = ic50FromKi(r.mechanism as InhibitionModel, {
    s: measured.substrateUm,
    km: kmUm,
    kic: r.kicUm ?? null,
    kiu: r.kiuUm ?? null,
  });
  const ratio = predicted / measured.ic50Um;
  const disagree = !(ratio <= CHENG_PRUSOFF_TOLERANCE && ratio >= 1 / CHENG_PRUSOFF_TOLERANCE);
  if (disagree) r.flags.push("cheng-prusoff-disagreement");
  return {
    predictedIc50Um: Number(predicted.toPrecision(10)),
    measuredIc50Um: measured.ic50Um,
    substrateUm: measured.substrateUm,
    kmUm,
    ratio: Number(ratio.toPrecision(6)),
    doseResponseExperimentId: measured.experimentId,
  };
}

/**
 * Computes an analysis and, in one transaction, writes its results and makes it current. A
 * failure at any point (including one thrown by `onProgress`) leaves the previous current
 * analysis and its results untouched; the analysis is marked failed with the reason.
 */
export async function runAnalysis(analysisId: string, onProgress?: Progress): Promise<void> {
  const a = await db.query.analyses.findFirst({ where: eq(analyses.id, analysisId) });
  if (!a) throw new Error(`analysis ${analysisId} not found`);
  if (a.status === "done") return;
  await db
    .update(analyses)
    .set({ status: "running", startedAt: new Date(), progress: 0, error: null })
    .where(eq(analyses.id, analysisId));
  const progress = async (f: number) => {
    await db
      .update(analyses)
      .set({ progress: Math.min(1, Math.max(0, f)) })
      .where(eq(analyses.id, analysisId));
    await onProgress?.(f);
  };
  try {
    const inputs = a.inputs;
    const readings = await loadReadings(inputs);
    await progress(0.1);
    let results: CompoundResult[];
    if (inputs.kind === "single-dose") {
      results = analyseSingleDose(readings, hitRuleOf(inputs)).results;
    } else if (inputs.kind === "dose-response") {
      results = analyseDoseResponse(readings, {
        fixTopPct: inputs.settings.fixTopPct ?? null,
        fixBottomPct: inputs.settings.fixBottomPct ?? null,
        enzymeUm: inputs.settings.resolved.enzymeNm !== null ? inputs.settings.resolved.enzymeNm / 1000 : null,
      });
    } else {
      results = analyseMechanism(readings, { weighting: inputs.settings.weighting ?? "none" });
      const measured = await measuredIc50s(
        a.campaignId,
        results.map((r) => r.compoundId),
      );
      for (const r of results) {
        const check = chengPrusoffCheck(r, measured.get(r.compoundId), inputs.settings.resolved.kmUm);
        if (check) r.detail.chengPrusoff = check;
      }
    }
    await progress(0.8);
    await db.transaction(async (tx) => {
      await tx
        .update(analyses)
        .set({ isCurrent: false })
        .where(and(eq(analyses.experimentId, a.experimentId), eq(analyses.isCurrent, true)));
      const chunk = 500;
      for (let k = 0; k < results.length; k += chunk) {
        await tx.insert(compoundResults).values(
          results.slice(k, k + chunk).map((r) => ({
            analysisId: a.id,
            experimentId: a.experimentId,
            campaignId: a.campaignId,
            kind: inputs.kind,
            compoundId: r.compoundId,
            nPoints: r.nPoints,
            pctInhibition: r.pctInhibition ?? null,
            pctInhibitionSd: r.pctInhibitionSd ?? null,
            hit: r.hit ?? null,
            ic50Um: r.ic50Um ?? null,
            ic50LoUm: r.ic50LoUm ?? null,
            ic50HiUm: r.ic50HiUm ?? null,
            ic50Qualifier: r.ic50Qualifier ?? null,
            hill: r.hill ?? null,
            mechanism: r.mechanism ?? null,
            mechanismLabel: r.mechanismLabel ?? null,
            kiUm: r.kiUm ?? null,
            kiLoUm: r.kiLoUm ?? null,
            kiHiUm: r.kiHiUm ?? null,
            kicUm: r.kicUm ?? null,
            kiuUm: r.kiuUm ?? null,
            alpha: r.alpha ?? null,
            flags: r.flags,
            detail: r.detail,
          })),
        );
      }
      await tx
        .update(analyses)
        .set({ status: "done", progress: 1, isCurrent: true, finishedAt: new Date(), compounds: results.length })
        .where(eq(analyses.id, a.id));
      // The hit grid's rows for these compounds, in the same transaction (issue 8), once this
      // analysis is current; prune drops compounds this experiment no longer reports.
      await refreshHitRows(
        tx,
        a.campaignId,
        results.map((r) => r.compoundId),
        { prune: true },
      );
    });
  } catch (e) {
    await db
      .update(analyses)
      .set({
        status: "failed",
        error: e instanceof Error ? e.message.slice(0, 500) : String(e).slice(0, 500),
        finishedAt: new Date(),
      })
      .where(eq(analyses.id, analysisId));
    throw e;
  }
}

// ---------------------------------------------------------------- results

export type OverrideRow = typeof mechanismOverrides.$inferSelect;

/** Current results of an experiment, one per compound, with the latest override of each. */
export async function experimentResults(experimentId: string) {
  const rows = await db
    .select({ r: compoundResults })
    .from(compoundResults)
    .innerJoin(analyses, eq(analyses.id, compoundResults.analysisId))
    .where(and(eq(compoundResults.experimentId, experimentId), eq(analyses.isCurrent, true)))
    .orderBy(asc(compoundResults.compoundId));
  const overrides = await db
    .selectDistinctOn([mechanismOverrides.compoundId])
    .from(mechanismOverrides)
    .where(eq(mechanismOverrides.experimentId, experimentId))
    .orderBy(mechanismOverrides.compoundId, desc(mechanismOverrides.at));
  const byCompound = new Map(overrides.map((o) => [o.compoundId, o]));
  return rows.map(({ r }) => ({ ...r, override: byCompound.get(r.compoundId) ?? null }));
}

type ResultRow = Awaited<ReturnType<typeof experimentResults>>[number];

/** The JSON shape of the results API (issue 7), concentrations in µM. */
export function resultJson(r: ResultRow) {
  const base: Record<string, unknown> = { compound: r.compoundId, n: r.nPoints };
  if (r.kind === "single-dose") {
    base.pctInhibition = r.pctInhibition;
    base.pctInhibitionSd = r.pctInhibitionSd;
    base.hit = r.hit;
    base.flags = r.flags;
  } else if (r.kind === "dose-response") {
    const d = r.detail as { fit?: { topPct: number | null; bottomPct: number | null }; morrison?: unknown };
    base.doseResponse = {
      ic50: r.ic50Um,
      ic50Qualifier: r.ic50Qualifier,
      ic50Ci95: [r.ic50LoUm, r.ic50HiUm],
      hill: r.hill,
      top: d.fit?.topPct ?? null,
      bottom: d.fit?.bottomPct ?? null,
      flags: r.flags,
      morrison: d.morrison ?? null,
    };
  } else {
    const d = r.detail as { models?: Record<string, unknown>; chengPrusoff?: unknown };
    const o = r.override;
    base.mechanism = {
      best: r.mechanism,
      label: r.mechanismLabel,
      kic: r.kicUm,
      kiu: r.kiuUm,
      alpha: r.alpha,
      ki: r.kiUm,
      kiCi95: [r.kiLoUm, r.kiHiUm],
      models: d.models ?? null,
      flags: r.flags,
      chengPrusoff: d.chengPrusoff ?? null,
      override: o ? { model: o.model, reason: o.reason, at: o.at.toISOString() } : null,
    };
  }
  return base;
}

export async function compoundResultDetail(experimentId: string, compoundId: string) {
  const rows = await experimentResults(experimentId);
  const r = rows.find((x) => x.compoundId === compoundId);
  if (!r) throw new AppError("not_found", "No result for this compound in the current analysis.");
  return r;
}

export const MODELS: InhibitionModel[] = ["competitive", "uncompetitive", "noncompetitive", "mixed"];

/** A lead or assay scientist overrides the chosen mechanism with a reason (audited). */
export async function overrideMechanism(
  actor: Actor,
  campaignId: string,
  experimentId: string,
  compoundId: string,
  model: InhibitionModel,
  reason: string,
) {
  const e = await getExperiment(campaignId, experimentId);
  if (e.kind !== "mechanism") throw new AppError("bad_request", "Only mechanism studies have a model choice.");
  const current = await compoundResultDetail(experimentId, compoundId);
  await db.transaction(async (tx) => {
    await tx.insert(mechanismOverrides).values({ experimentId, compoundId, model, reason, by: actor.id });
    await audit(tx, actor, {
      campaignId,
      action: "mechanism.override",
      entityType: "compound-result",
      entityId: `${experimentId}/${compoundId}`,
      before: { model: current.override?.model ?? current.mechanism },
      after: { model },
      reason,
    });
    await refreshHitRows(tx, campaignId, [compoundId]);
  });
}
