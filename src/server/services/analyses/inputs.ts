import "server-only";
import crypto from "node:crypto";
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import {
  experimentRuns,
  plateRuns,
  plateWellMasks,
  type AnalysisInputs,
  type ExperimentSettings,
} from "@/server/db/schema";
import { ENGINE_VERSION } from "@/lib/kinetics";
import { campaignKmUm, toNanomolar } from "@/lib/units";
import { DEFAULT_ANALYSIS_WEIGHTING } from "@/lib/analysis/settings";
import type { Campaign } from "../campaigns";
import type { Experiment } from "./experiments";

/**
 * The experiment's settings with what it leaves unset taken from the campaign (Km, [E], hit
 * threshold) or the defaults (weighting "auto", robust off). They are part of the inputs, so a
 * change of any of them changes the input hash and gives a new analysis.
 */
function resolvedSettings(campaign: Campaign, s: ExperimentSettings): AnalysisInputs["settings"]["resolved"] {
  const campaignENm =
    campaign.enzymeConcValue !== null ? toNanomolar(campaign.enzymeConcValue, campaign.enzymeConcUnit ?? "nM") : null;
  return {
    hitThresholdPct: s.hitRule?.kind === "threshold" ? s.hitRule.thresholdPct : campaign.hitThresholdPct,
    kmUm: s.kmUm ?? campaignKmUm(campaign),
    enzymeNm: s.enzymeNm ?? campaignENm,
    weighting: s.weighting ?? DEFAULT_ANALYSIS_WEIGHTING,
    robust: s.robust ?? false,
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

/**
 * What an analysis of this experiment would be computed from right now (its provenance: engine
 * version, resolved settings, accepted runs with their SHA-256s, active masks) and the hash of
 * that. Only accepted runs count.
 */
export async function currentInputs(
  campaign: Campaign,
  experiment: Experiment,
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
