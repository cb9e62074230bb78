import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { requestAnalysis } from "@/server/services/analyses";
import { enqueueAnalysis } from "@/server/jobs/boss";

export const dynamic = "force-dynamic";

/**
 * Starts an analysis of the experiment in the background (202). The same inputs as the current
 * analysis give that analysis back, already done.
 */
export const POST = route<{ campaignId: string; experimentId: string }>(async (_req, { campaignId, experimentId }) => {
  const { user, campaign } = await requireCampaign(campaignId, "analysis:run");
  const a = await requestAnalysis(user, campaign, experimentId);
  if (a.status === "queued") await enqueueAnalysis(a.id);
  return json({ id: a.id, status: a.status, reused: a.reused }, 202);
});
