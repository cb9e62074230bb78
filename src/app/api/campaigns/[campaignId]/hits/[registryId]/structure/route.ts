import { requireCampaign } from "@/server/auth/guard";
import { route } from "@/server/http";
import { hitStructureKey } from "@/server/services/hits";
import { structureSvg } from "@/lib/chem/svg";
import { registryIdParam } from "../schema";

export const dynamic = "force-dynamic";

// Drawings are the slow part of a grid page (openchemlib layout), so they are served one per
// request, cached by the browser, and the page of rows stays a plain index scan.
const cache = new Map<string, string>();
const CACHE_MAX = 5000;

/** The compound's structure as SVG (members); `?size=thumb|large`. */
export const GET = route<{ campaignId: string; registryId: string }>(async (req, { campaignId, registryId }) => {
  await requireCampaign(campaignId);
  const key = await hitStructureKey(campaignId, registryIdParam(registryId));
  const large = new URL(req.url).searchParams.get("size") === "large";
  const ck = `${large ? "L" : "T"}|${key}`;
  let svg = cache.get(ck);
  if (!svg) {
    svg = large
      ? structureSvg(key, { width: 320, height: 240, idPrefix: "l-" })
      : structureSvg(key, { width: 120, height: 72, idPrefix: "t-" });
    if (cache.size >= CACHE_MAX) cache.delete(cache.keys().next().value!);
    cache.set(ck, svg);
  }
  return new Response(svg, {
    headers: {
      "content-type": "image/svg+xml; charset=utf-8",
      "cache-control": "private, max-age=3600",
      "x-content-type-options": "nosniff",
    },
  });
});
