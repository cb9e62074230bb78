import { z } from "zod";
import { EXPERIMENT_KINDS } from "@/lib/analysis/kinds";
import { ANALYSIS_WEIGHTINGS } from "@/lib/analysis/settings";

export { ANALYSIS_WEIGHTINGS, DEFAULT_ANALYSIS_WEIGHTING, type AnalysisWeighting } from "@/lib/analysis/settings";

const pos = z.number().finite().positive();

export const experimentSettingsSchema = z
  .object({
    hitRule: z
      .discriminatedUnion("kind", [
        z.object({ kind: z.literal("threshold"), thresholdPct: z.number().min(0).max(100) }),
        z.object({ kind: z.literal("sd"), k: z.number().min(0).max(10) }),
        z.object({ kind: z.literal("robust"), k: z.number().min(0).max(10) }),
      ])
      .optional(),
    /** Dose-response and mechanism fits (see ANALYSIS_WEIGHTINGS). */
    weighting: z.enum(ANALYSIS_WEIGHTINGS).optional(),
    /** Report the fit without the outliers a robust fit finds (they are proposed as masks either way). */
    robust: z.boolean().optional(),
    fixTopPct: z.number().finite().nullable().optional(),
    fixBottomPct: z.number().finite().nullable().optional(),
    substrateUm: pos.nullable().optional(),
    kmUm: pos.nullable().optional(),
    enzymeNm: pos.nullable().optional(),
  })
  .strict();

export const createExperimentSchema = z.object({
  name: z.string().trim().min(1, "Name the experiment.").max(120),
  kind: z.enum(EXPERIMENT_KINDS),
  runIds: z.array(z.string().uuid("Each run id must be a UUID.")).min(1, "Choose at least one plate run.").max(2000),
  settings: experimentSettingsSchema.optional(),
});
