import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses, compoundResults, wellReadings, type AnalysisInputs } from "@/server/db/schema";
import type { HitRule } from "@/lib/kinetics";
import {
  analyseDoseResponse,
  analyseMechanism,
  analyseSingleDose,
  type AnalysisReading,
  type CompoundResult,
} from "@/lib/analysis/compute";
import { isFittedMechanism } from "@/lib/analysis/detail";
import { engineOptionsFrom } from "@/lib/analysis/settings";
import { LIVENESS } from "@/server/jobs/boss";
import { refreshHitRows } from "../hits";
import { chengPrusoffCheck, measuredIc50s } from "./cheng-prusoff";

export type Progress = (fraction: number) => Promise<void> | void;

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

/** The engine's results for the analysis's inputs (mechanism results with their Cheng–Prusoff check). */
async function compute(
  campaignId: string,
  inputs: AnalysisInputs,
  readings: AnalysisReading[],
): Promise<CompoundResult[]> {
  if (inputs.kind === "single-dose") return analyseSingleDose(readings, hitRuleOf(inputs)).results;
  const options = engineOptionsFrom(inputs.settings);
  if (inputs.kind === "dose-response") return analyseDoseResponse(readings, options.doseResponse);
  const results = analyseMechanism(readings, options.mechanism);
  const measured = await measuredIc50s(
    campaignId,
    results.map((r) => r.compoundId),
  );
  for (const r of results) {
    const check = chengPrusoffCheck(r, measured.get(r.compoundId), inputs.settings.resolved.kmUm);
    if (check && isFittedMechanism(r.detail)) r.detail.chengPrusoff = check;
  }
  return results;
}

/** Thrown inside the commit when another take of the analysis has claimed it meanwhile. */
class Superseded extends Error {}

/**
 * Computes an analysis and, in one transaction, writes its results and makes it current. A
 * failure at any point (including one thrown by `onProgress`) leaves the previous current
 * analysis and its results untouched; the analysis is marked failed with the reason.
 *
 * Exactly once, with several workers and dead ones: the take starts with a conditional UPDATE
 * (queued or failed → running, attempts + 1), so a duplicate job finds nothing to do; while it
 * runs, the row's heartbeat is renewed every ~10 s, so a take whose worker died is re-queued
 * (recover.ts); and the commit goes ahead only while this take is still the row's latest, so a
 * take that was thought dead and re-queued cannot write a second set of results.
 */
export async function runAnalysis(analysisId: string, onProgress?: Progress): Promise<void> {
  const [a] = await db
    .update(analyses)
    .set({
      status: "running",
      startedAt: new Date(),
      heartbeatAt: new Date(),
      progress: 0,
      error: null,
      attempts: sql`${analyses.attempts} + 1`,
    })
    .where(and(eq(analyses.id, analysisId), inArray(analyses.status, ["queued", "failed"])))
    .returning();
  if (!a) {
    const exists = await db.query.analyses.findFirst({ where: eq(analyses.id, analysisId), columns: { id: true } });
    if (!exists) throw new Error(`analysis ${analysisId} not found`);
    return; // done, or running in another take: nothing to do for this job
  }
  const mine = and(eq(analyses.id, analysisId), eq(analyses.status, "running"), eq(analyses.attempts, a.attempts));
  const beat = setInterval(() => {
    db.update(analyses)
      .set({ heartbeatAt: new Date() })
      .where(mine)
      .catch((e) => console.error(`[analysis] heartbeat of ${analysisId} failed:`, e instanceof Error ? e.message : e));
  }, LIVENESS.heartbeatMs);
  beat.unref?.();
  const progress = async (f: number) => {
    await db
      .update(analyses)
      .set({ progress: Math.min(1, Math.max(0, f)), heartbeatAt: new Date() })
      .where(mine);
    await onProgress?.(f);
  };
  try {
    const inputs = a.inputs;
    const readings = await loadReadings(inputs);
    await progress(0.1);
    const results = await compute(a.campaignId, inputs, readings);
    await progress(0.8);
    await db.transaction(async (tx) => {
      // The fence: this take commits only while it is still the latest; the row lock also makes
      // a concurrent re-queue wait for this commit (and then find the analysis done).
      const [still] = await tx.select({ id: analyses.id }).from(analyses).where(mine).for("update");
      if (!still) throw new Superseded();
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
      // The hit grid's rows for these compounds, in the same transaction, once this analysis is
      // current; prune drops compounds this experiment no longer reports.
      await refreshHitRows(
        tx,
        a.campaignId,
        results.map((r) => r.compoundId),
        { prune: true },
      );
    });
  } catch (e) {
    if (e instanceof Superseded) {
      console.warn(
        `[analysis] ${analysisId}: take ${a.attempts} was superseded by a later take; its results were not written`,
      );
      return;
    }
    await db
      .update(analyses)
      .set({
        status: "failed",
        error: e instanceof Error ? e.message.slice(0, 500) : String(e).slice(0, 500),
        finishedAt: new Date(),
      })
      .where(mine);
    throw e;
  } finally {
    clearInterval(beat);
  }
}
