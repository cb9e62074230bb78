import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { assignBatchFile } from "@/server/services/plates/batches";
import { PostAssignBatchFileBody } from "./schema";

export const dynamic = "force-dynamic";

/** Give an unmatched (or refused) file of a batch its plate map and upload it (assay scientists and admins). */
export const POST = route<{ campaignId: string; batchId: string; fileId: string }>(
  async (req, { campaignId, batchId, fileId }) => {
    const { user, campaign } = await requireCampaign(campaignId, "plate:write");
    const body = await parseJson(req, PostAssignBatchFileBody);
    return json(await assignBatchFile(user, campaign, batchId, fileId, body.plateMapId));
  },
);
