import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses, compoundResults, experiments } from "@/server/db/schema";
import { ic50FromKi } from "@/lib/kinetics";
import type { CompoundResult } from "@/lib/analysis/compute";
import type { ChengPrusoffCheck } from "@/lib/analysis/detail";

/** Cheng–Prusoff cross-check: predicted and measured IC50 further apart than this are flagged (common practice). */
export const CHENG_PRUSOFF_TOLERANCE = 3;

export type MeasuredIc50 = { ic50Um: number; substrateUm: number | null; experimentId: string };

/** The measured IC50 (current dose-response analyses of the campaign) of each compound, µM. */
export async function measuredIc50s(campaignId: string, compoundIds: string[]): Promise<Map<string, MeasuredIc50>> {
  if (compoundIds.length === 0) return new Map<string, MeasuredIc50>();
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
  const m = new Map<string, MeasuredIc50>();
  for (const r of rows)
    if (r.ic50Um !== null && !r.qualifier)
      m.set(r.compoundId, {
        ic50Um: r.ic50Um,
        substrateUm: r.settings.substrateUm ?? null,
        experimentId: r.experimentId,
      });
  return m;
}

/**
 * Cheng–Prusoff: the IC50 the fitted mechanism predicts at the dose-response assay's [S], against
 * the measured one (Cheng & Prusoff, Biochem Pharmacol 1973;22:3099). Flags the result when they
 * are more than CHENG_PRUSOFF_TOLERANCE-fold apart.
 */
export function chengPrusoffCheck(
  r: CompoundResult,
  measured: MeasuredIc50 | undefined,
  kmUm: number | null,
): ChengPrusoffCheck | null {
  if (!measured || !r.mechanism) return null;
  if (measured.substrateUm === null || measured.substrateUm === undefined || kmUm === null) {
    return {
      measuredIc50Um: measured.ic50Um,
      note: "substrate concentration of the dose-response assay or Km not set: no prediction",
    };
  }
  const predicted = ic50FromKi(r.mechanism, {
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
