import { z } from "zod";

export const maskReason = z
  .string({ message: "reason: give a reason (at least 3 characters)." })
  .trim()
  .min(3, "reason: give at least 3 characters.")
  .max(500, "reason: at most 500 characters.");

/** Body of POST …/plate-runs/{runId}/masks: wells of the run's plate format (e.g. "B3"), one reason for all. */
export const PostMasksBody = z.strictObject({
  wells: z
    .array(z.string().trim().min(2, "wells: a well name such as B3").max(5, "wells: a well name such as B3"))
    .min(1, "wells: name at least one well.")
    .max(400, "wells: at most 400 wells at once."),
  reason: maskReason,
});

/** Answer of POST …/masks and DELETE …/masks/{well}: the wells changed and the run's recomputed QC. */
export const MasksResponse = z.object({
  runId: z.string().uuid(),
  wells: z.array(z.string()),
  masked: z.boolean(),
  qc: z.object({ zPrime: z.number().nullable(), verdict: z.enum(["pass", "fail"]), reasons: z.array(z.string()) }),
});
