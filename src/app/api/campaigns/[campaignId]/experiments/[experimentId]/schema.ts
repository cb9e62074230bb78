import { z } from "zod";
import { experimentSettingsSchema } from "@/lib/validation/experiments";

/**
 * Body of PATCH …/experiments/{experimentId}: `runIds` replaces the experiment's plate runs,
 * `settings` replaces its settings (the same fields as on creation). The next analysis uses them.
 */
export const PatchExperimentBody = z
  .strictObject({
    runIds: z
      .array(z.string().uuid("runIds: each run id must be a UUID."))
      .min(1, "runIds: choose at least one plate run.")
      .max(2000, "runIds: at most 2000 plate runs.")
      .optional(),
    settings: experimentSettingsSchema.optional(),
  })
  .refine((b) => b.runIds !== undefined || b.settings !== undefined, {
    message: "Nothing to change: give runIds, settings or both.",
  });

export const PatchExperimentResponse = z.object({
  id: z.string().uuid(),
  runIds: z.array(z.string().uuid()),
  settings: experimentSettingsSchema,
});
