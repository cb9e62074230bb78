import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { retryAnalysis } from "@/server/services/analyses";

export const dynamic = "force-dynamic";

/**
 * Runs a failed analysis again with the same inputs (202, queued for the worker; audited). 409
 * when it is not failed or a newer analysis of the experiment exists.
 */
export const POST = route<{ campaignId: string; experimentId: string; analysisId: string }>(
  async (_req, { campaignId, experimentId, analysisId }) => {
    const { user, campaign } = await requireCampaign(campaignId, "analysis:run");
    const a = await retryAnalysis(user, campaign, experimentId, analysisId);
    return json(a, 202);
  },
);
