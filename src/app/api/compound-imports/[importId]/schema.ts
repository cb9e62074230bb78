import { z } from "zod";

/** Path of /api/compound-imports/{importId}. */
export const importIdParam = z.object({ importId: z.string().uuid("importId must be an import id") });
