import { z } from "zod";

export const runParams = z.object({ campaignId: z.string(), runId: z.string().uuid("No such plate run.") });
