import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { acceptPassing } from "@/server/services/plates/batches";
import { PostAcceptPassingBody } from "./schema";

export const dynamic = "force-dynamic";

/** Accept every run of the batch that passes QC and is undecided, with one reason (assay scientists and admins). */
export const POST = route<{ campaignId: string; batchId: string }>(async (req, { campaignId, batchId }) => {
  const { user, campaign } = await requireCampaign(campaignId, "plate:write");
  const body = await parseJson(req, PostAcceptPassingBody);
  return json(await acceptPassing(user, campaign, batchId, body.reason));
});
