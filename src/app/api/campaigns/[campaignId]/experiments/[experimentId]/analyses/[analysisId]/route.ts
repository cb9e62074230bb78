import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { analysisJson, getAnalysis, getExperiment } from "@/server/services/analyses";
import { AppError } from "@/server/errors";

export const dynamic = "force-dynamic";

/** Status and progress (0–1) of one analysis, with its provenance. */
export const GET = route<{ campaignId: string; experimentId: string; analysisId: string }>(
  async (_req, { campaignId, experimentId, analysisId }) => {
    await requireCampaign(campaignId);
    await getExperiment(campaignId, experimentId);
    const a = await getAnalysis(campaignId, analysisId);
    if (a.experimentId !== experimentId) throw new AppError("not_found", "No such analysis.");
    return json(analysisJson(a));
  },
);
