import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { copyPlateMap } from "@/server/services/plates";
import { PostPlateMapCopyBody } from "../schema";

export const dynamic = "force-dynamic";

/** Copy a plate map as a template under a new name (assay scientists and admins; audited): 201 {id}; 409 if the name is taken. */
export const POST = route<{ campaignId: string; plateMapId: string }>(async (req, { campaignId, plateMapId }) => {
  const { user } = await requireCampaign(campaignId, "plate:write");
  const body = await parseJson(req, PostPlateMapCopyBody);
  return json(await copyPlateMap(user, campaignId, plateMapId, body.name), 201);
});
