import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses, compoundResults, mechanismOverrides, wellReadings, type AnalysisInputs } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { INHIBITION_MODELS, type InhibitionModel } from "@/lib/kinetics";
import {
  isFittedDoseResponse,
  isFittedMechanism,
  parseResultDetail,
  type DoseResponseDetail,
  type MechanismDetail,
  type SingleDoseDetail,
} from "@/lib/analysis/detail";

export type OverrideRow = typeof mechanismOverrides.$inferSelect;
type StoredResult = typeof compoundResults.$inferSelect;

/** A current result with its detail parsed for its kind, and the latest mechanism override. */
export type ExperimentResult = Omit<StoredResult, "kind" | "detail"> & { override: OverrideRow | null } & (
    | { kind: "single-dose"; detail: SingleDoseDetail }
    | { kind: "dose-response"; detail: DoseResponseDetail }
    | { kind: "mechanism"; detail: MechanismDetail }
  );

function typed(r: StoredResult, override: OverrideRow | null): ExperimentResult {
  if (r.kind === "single-dose") return { ...r, kind: r.kind, detail: parseResultDetail(r.kind, r.detail), override };
  if (r.kind === "dose-response") return { ...r, kind: r.kind, detail: parseResultDetail(r.kind, r.detail), override };
  return { ...r, kind: r.kind, detail: parseResultDetail(r.kind, r.detail), override };
}

/** Current results of an experiment, one per compound, with the latest override of each. */
export async function experimentResults(experimentId: string): Promise<ExperimentResult[]> {
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
  return rows.map(({ r }) => typed(r, byCompound.get(r.compoundId) ?? null));
}

export async function compoundResultDetail(experimentId: string, compoundId: string): Promise<ExperimentResult> {
  const rows = await experimentResults(experimentId);
  const r = rows.find((x) => x.compoundId === compoundId);
  if (!r) throw new AppError("not_found", "No result for this compound in the current analysis.");
  return r;
}

/** The model a mechanism result stands for: the latest override, else the fitted choice. */
export function chosenModel(r: ExperimentResult): InhibitionModel | null {
  const pick = (m: string | null | undefined) => INHIBITION_MODELS.find((x) => x === m) ?? null;
  return pick(r.override?.model) ?? pick(r.mechanism);
}

/**
 * The masked wells of one compound in an analysis's inputs, as [concentration µM, % inhibition]:
 * drawn on the dose-response plot as left out of the fit.
 */
export async function maskedPoints(inputs: AnalysisInputs, compoundId: string): Promise<[number, number][]> {
  if (inputs.masks.length === 0) return [];
  const rows = await db
    .select({
      runId: wellReadings.runId,
      well: wellReadings.well,
      concentrationUm: wellReadings.concentrationUm,
      inhibitionPct: wellReadings.inhibitionPct,
    })
    .from(wellReadings)
    .where(
      and(
        inArray(wellReadings.runId, [...new Set(inputs.masks.map((m) => m.runId))]),
        eq(wellReadings.compoundId, compoundId),
      ),
    );
  const masked = new Set(inputs.masks.map((m) => `${m.runId}|${m.well}`));
  const out: [number, number][] = [];
  for (const m of rows)
    if (masked.has(`${m.runId}|${m.well}`) && m.concentrationUm !== null && m.inhibitionPct !== null)
      out.push([m.concentrationUm, m.inhibitionPct]);
  return out;
}

/** The JSON shape of the results API, concentrations in µM. */
export function resultJson(r: ExperimentResult) {
  const base = { compound: r.compoundId, n: r.nPoints };
  if (r.kind === "single-dose") {
    return { ...base, pctInhibition: r.pctInhibition, pctInhibitionSd: r.pctInhibitionSd, hit: r.hit, flags: r.flags };
  }
  if (r.kind === "dose-response") {
    const d = isFittedDoseResponse(r.detail) ? r.detail : null;
    return {
      ...base,
      doseResponse: {
        ic50: r.ic50Um,
        ic50Qualifier: r.ic50Qualifier,
        ic50Ci95: [r.ic50LoUm, r.ic50HiUm],
        hill: r.hill,
        top: d?.fit.topPct ?? null,
        bottom: d?.fit.bottomPct ?? null,
        flags: r.flags,
        morrison: d?.morrison ?? null,
      },
    };
  }
  const d = isFittedMechanism(r.detail) ? r.detail : null;
  const o = r.override;
  return {
    ...base,
    mechanism: {
      best: r.mechanism,
      label: r.mechanismLabel,
      kic: r.kicUm,
      kiu: r.kiuUm,
      alpha: r.alpha,
      ki: r.kiUm,
      kiCi95: [r.kiLoUm, r.kiHiUm],
      models: d?.models ?? null,
      flags: r.flags,
      chengPrusoff: d?.chengPrusoff ?? null,
      override: o ? { model: o.model, reason: o.reason, at: o.at.toISOString() } : null,
    },
  };
}
