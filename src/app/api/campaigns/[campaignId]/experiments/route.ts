import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { createExperiment, listExperiments } from "@/server/services/analyses";
import { postBody } from "./schema";

export const dynamic = "force-dynamic";

/** Creates an experiment from plate runs of this campaign (lead, assay scientist, admin). */
export const POST = route<{ campaignId: string }>(async (req, { campaignId }) => {
  const { user, campaign } = await requireCampaign(campaignId, "analysis:run");
  const body = await parseJson(req, postBody);
  const { id } = await createExperiment(user, campaign, body);
  return json({ id }, 201);
});

/** The campaign's experiments with the status of their latest analysis. */
export const GET = route<{ campaignId: string }>(async (_req, { campaignId }) => {
  await requireCampaign(campaignId);
  const list = await listExperiments(campaignId);
  return json({
    items: list.map((e) => ({
      id: e.experiment.id,
      name: e.experiment.name,
      kind: e.experiment.kind,
      runs: e.runs,
      acceptedRuns: e.acceptedRuns,
      settings: e.experiment.settings,
      latestAnalysis: e.latest
        ? {
            id: e.latest.id,
            status: e.latest.status,
            progress: e.latest.progress,
            requestedAt: e.latest.requestedAt.toISOString(),
          }
        : null,
      currentAnalysisId: e.current?.id ?? null,
    })),
  });
});
