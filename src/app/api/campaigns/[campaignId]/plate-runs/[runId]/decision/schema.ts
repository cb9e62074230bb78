import { z } from "zod";

const reason = z
  .string()
  .trim()
  .min(3, "reason: give at least 3 characters.")
  .max(500, "reason: at most 500 characters.");

/** Body of POST …/plate-runs/{runId}/decision: a reason is required to reject (a pass may be accepted without one). */
export const PostDecisionBody = z
  .strictObject({
    decision: z.enum(["accept", "reject"], { message: 'decision must be "accept" or "reject"' }),
    reason: reason.optional(),
  })
  .refine((b) => b.decision === "accept" || b.reason !== undefined, {
    message: "reason: give a reason for rejecting the run.",
    path: ["reason"],
  });

/** Answer: the run's decision as stored. */
export const PostDecisionResponse = z.object({
  runId: z.string().uuid(),
  decision: z.enum(["accepted", "rejected"]),
  reason: z.string(),
  verdict: z.enum(["pass", "fail"]),
  zPrime: z.number().nullable(),
});
