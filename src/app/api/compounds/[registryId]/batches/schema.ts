import { z } from "zod";
import { batchSchema, stockSchema } from "@/lib/chem/validation";

/**
 * Body of POST /api/compounds/{registryId}/batches: the batch's fields (all optional; the batch
 * number is the next free one) and, optionally, a stock solution made from it.
 */
export const PostBatchBody = z.strictObject({ batch: batchSchema.optional(), stock: stockSchema.optional() });

/** Answer of POST …/batches (201). */
export const PostBatchResponse = z.object({ registryId: z.string(), batchNumber: z.number().int().min(1) });
