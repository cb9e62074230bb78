import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { experimentResults, getExperiment, resultJson } from "@/server/services/analyses";

export const dynamic = "force-dynamic";

/** One object per compound from the current analysis; concentrations in µM. */
export const GET = route<{ campaignId: string; experimentId: string }>(async (_req, { campaignId, experimentId }) => {
  await requireCampaign(campaignId);
  await getExperiment(campaignId, experimentId);
  const rows = await experimentResults(experimentId);
  return json(rows.map(resultJson));
});
