import { z } from "zod";

/** Body of POST /api/compound-imports/{importId}/commit: the mode, chosen explicitly. */
export const commitBody = z.object({
  mode: z.enum(["all_or_nothing", "valid_only"], { error: 'mode: choose "all_or_nothing" or "valid_only"' }),
});
