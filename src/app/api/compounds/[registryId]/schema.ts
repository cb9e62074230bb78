import { z } from "zod";

/** Path of GET /api/compounds/{registryId}. */
export const registryIdParam = z.object({
  registryId: z
    .string()
    .trim()
    .min(1)
    .max(40, "registryId is too long")
    .regex(/^[A-Za-z][A-Za-z0-9]{0,7}-\d{1,9}$/, "registryId must look like INH-000123"),
});
