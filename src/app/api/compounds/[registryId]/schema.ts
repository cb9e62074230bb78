import { z } from "zod";
import { REGISTRY_ID_SHAPE } from "@/lib/registry-id";

/** Path of GET /api/compounds/{registryId}. */
export const registryIdParam = z.object({
  registryId: z
    .string()
    .trim()
    .min(1)
    .max(40, "registryId is too long")
    .regex(new RegExp(`^${REGISTRY_ID_SHAPE.source}$`), "registryId must look like INH-000123"),
});
