import { z } from "zod";

/** Body of POST …/plate-batches/{batchId}/accept-passing: one reason for every run accepted. */
export const PostAcceptPassingBody = z.object({
  reason: z.string().trim().min(3, "reason: at least 3 characters").max(500, "reason: at most 500 characters"),
});

/** Answer: the runs accepted, and how many were left (failing QC, or decided already). */
export const PostAcceptPassingResponse = z.object({
  accepted: z.array(z.string().uuid()),
  failing: z.number().int(),
  alreadyDecided: z.number().int(),
});
