import { z } from "zod";
import { stockSchema } from "@/lib/chem/validation";
import { registryIdParam } from "../../../schema";

/** Path of …/batches/{batchNumber}/stocks: the batch's number within its compound (1, 2, …). */
export const stocksParams = registryIdParam.extend({
  batchNumber: z.coerce
    .number({ error: "batchNumber must be a whole number." })
    .int("batchNumber must be a whole number.")
    .min(1, "batchNumber starts at 1.")
    .max(1_000_000, "batchNumber is too large."),
});

/** Body of POST …/stocks: a stock solution (concentration in mM, volume in µL); at least one field. */
export const PostStockBody = stockSchema.strict().refine((s) => Object.values(s).some((v) => v !== undefined), {
  message: "Give at least one of concentrationMm, solvent, volumeUl, location, date.",
});

/** Answer of POST …/stocks (201). */
export const PostStockResponse = z.object({
  id: z.string().uuid(),
  registryId: z.string(),
  batchNumber: z.number().int().min(1),
});
