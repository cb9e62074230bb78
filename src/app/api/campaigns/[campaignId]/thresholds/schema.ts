import { z } from "zod";

/**
 * Body of PATCH /api/campaigns/{campaignId}/thresholds (the team page's settings form): the
 * plate QC pass marks — lowest Z′ (dimensionless, −1 to 1) and highest control CV in % — and the
 * single-dose hit threshold in % inhibition. Fields left out keep their value.
 */
export const PatchThresholdsBody = z
  .strictObject({
    qcMinZPrime: z
      .number({ error: "qcMinZPrime must be a number." })
      .min(-1, "Z′ is at least −1.")
      .max(1, "Z′ is at most 1.")
      .optional(),
    qcMaxCvPct: z
      .number({ error: "qcMaxCvPct must be a number (%)." })
      .positive("Use a positive CV (%).")
      .max(100, "CV is at most 100 %.")
      .optional(),
    hitThresholdPct: z
      .number({ error: "hitThresholdPct must be a number (% inhibition)." })
      .min(0, "The hit threshold is 0–100 % inhibition.")
      .max(100, "The hit threshold is 0–100 % inhibition.")
      .optional(),
  })
  .refine((b) => Object.values(b).some((v) => v !== undefined), {
    message: "Give at least one of qcMinZPrime, qcMaxCvPct, hitThresholdPct.",
  });

/** The thresholds as GET and PATCH answer them, with their units. */
export const ThresholdsResponse = z.object({
  qcMinZPrime: z.number(),
  qcMaxCvPct: z.number(),
  hitThresholdPct: z.number(),
  units: z.object({ qcMinZPrime: z.string(), qcMaxCvPct: z.string(), hitThresholdPct: z.string() }),
});
