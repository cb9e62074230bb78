import { z } from "zod";

/** Body of POST …/plate-batches/{batchId}/files/{fileId}/assign. */
export const PostAssignBatchFileBody = z.object({
  plateMapId: z.string().uuid("plateMapId must be a plate map id"),
});

/** Answer: the file's new outcome. */
export const PostAssignBatchFileResponse = z.object({
  fileId: z.string().uuid(),
  outcome: z.enum(["pending", "stored", "duplicate", "refused", "unmatched"]),
  runId: z.string().uuid().nullable().optional(),
  existingRunId: z.string().uuid().nullable().optional(),
  message: z.string().nullable().optional(),
});
