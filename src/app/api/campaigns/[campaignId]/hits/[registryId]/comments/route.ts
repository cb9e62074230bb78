import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { addComment } from "@/server/services/hits";
import { commentBody, registryIdParam } from "../schema";

export const dynamic = "force-dynamic";

/** Adds a comment on a compound `{ body }` (lead, chemist, assay scientist, admin). */
export const POST = route<{ campaignId: string; registryId: string }>(async (req, { campaignId, registryId }) => {
  const { user } = await requireCampaign(campaignId, "campaign:comment");
  const body = await parseJson(req, commentBody);
  return json(await addComment(user, campaignId, registryIdParam(registryId), body.body), 201);
});
