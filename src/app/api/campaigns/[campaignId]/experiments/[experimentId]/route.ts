import type { z } from "zod";
import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { updateExperiment } from "@/server/services/analyses";
import { PatchExperimentBody, type PatchExperimentResponse } from "./schema";

export const dynamic = "force-dynamic";

/**
 * Change an experiment's plate runs and/or settings (assay scientists, leads and admins; audited).
 * 400 for runs outside the campaign or bad settings; the results shown stay until the next analysis.
 */
export const PATCH = route<{ campaignId: string; experimentId: string }>(async (req, { campaignId, experimentId }) => {
  const { user, campaign } = await requireCampaign(campaignId, "analysis:run");
  const body = await parseJson(req, PatchExperimentBody);
  const out: z.infer<typeof PatchExperimentResponse> = await updateExperiment(user, campaign, experimentId, body);
  return json(out);
});
