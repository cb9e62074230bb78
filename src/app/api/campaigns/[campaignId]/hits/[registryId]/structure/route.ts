import { requireCampaign } from "@/server/auth/guard";
import { route } from "@/server/http";
import { hitStructureKey } from "@/server/services/hits";
import { drawingResponse } from "@/server/services/compounds";
import { registryIdParam } from "../schema";

export const dynamic = "force-dynamic";

/**
 * The structure of a compound on this campaign's hit list as SVG (members of the campaign only;
 * a compound not on its list is 404, whatever the registry holds); `?size=thumb|large`. Drawn in
 * the chemistry worker pool and cached there by structure and size; the response carries an ETag
 * and is cached privately by the browser, so a grid page costs no drawing on a revisit.
 */
export const GET = route<{ campaignId: string; registryId: string }>(async (req, { campaignId, registryId }) => {
  await requireCampaign(campaignId);
  const key = await hitStructureKey(campaignId, registryIdParam(registryId));
  const large = new URL(req.url).searchParams.get("size") === "large";
  return drawingResponse(
    req,
    key,
    large ? { width: 320, height: 240, idPrefix: "l-" } : { width: 120, height: 72, idPrefix: "t-" },
  );
});
