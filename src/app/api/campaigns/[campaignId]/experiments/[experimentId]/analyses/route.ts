import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { requestAnalysis } from "@/server/services/analyses";

export const dynamic = "force-dynamic";

/**
 * Starts an analysis of the experiment in the background (202; the service queues the job). The
 * same inputs as the current analysis give that analysis back, already done.
 */
export const POST = route<{ campaignId: string; experimentId: string }>(async (_req, { campaignId, experimentId }) => {
  const { user, campaign } = await requireCampaign(campaignId, "analysis:run");
  const a = await requestAnalysis(user, campaign, experimentId);
  return json({ id: a.id, status: a.status, reused: a.reused }, 202);
});
