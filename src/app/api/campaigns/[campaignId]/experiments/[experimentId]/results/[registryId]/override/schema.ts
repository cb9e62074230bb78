import { z } from "zod";
import { INHIBITION_MODELS } from "@/lib/kinetics";

/** Body of POST …/results/{registryId}/override: the mechanism to report instead of the fitted choice, and why. */
export const PostOverrideBody = z.strictObject({
  model: z.enum(INHIBITION_MODELS, { message: `model must be one of ${INHIBITION_MODELS.join(", ")}` }),
  reason: z
    .string({ message: "reason: give a reason of at least a few words." })
    .trim()
    .min(5, "reason: give a reason of at least a few words.")
    .max(500, "reason: at most 500 characters."),
});

export const PostOverrideResponse = z.object({
  registryId: z.string(),
  model: z.enum(INHIBITION_MODELS),
  reason: z.string(),
});
