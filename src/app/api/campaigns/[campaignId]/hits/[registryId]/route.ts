import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { hitDetail, setTriageStatus } from "@/server/services/hits";
import { patchBody, registryIdParam } from "./schema";

export const dynamic = "force-dynamic";

type P = { campaignId: string; registryId: string };

/** The compound panel: hit row, structure facts, current results with plot data, batches, status history, comments (members). */
export const GET = route<P>(async (_req, { campaignId, registryId }) => {
  await requireCampaign(campaignId);
  return json(await hitDetail(campaignId, registryIdParam(registryId)));
});

/** Sets one compound's triage status `{ status, comment? }` (leads, admins; 403 for anyone else). */
export const PATCH = route<P>(async (req, { campaignId, registryId }) => {
  const { user } = await requireCampaign(campaignId, "triage:write");
  const body = await parseJson(req, patchBody);
  const r = await setTriageStatus(user, campaignId, [registryIdParam(registryId)], body.status, body.comment);
  return json({ registryId: registryIdParam(registryId), status: r.status, changed: r.changed > 0 });
});
