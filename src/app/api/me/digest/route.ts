import { requireCampaign, requireUser } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { campaignsFor } from "@/server/services/campaigns";
import { optIn, optOut, optOutsOf } from "@/server/services/digest";
import { GetMyDigestResponse, PutMyDigestBody, PutMyDigestResponse } from "./schema";
import type { z } from "zod";

export const dynamic = "force-dynamic";

/** For each campaign I am a member of: do I receive its weekly digest (as on the settings page)? */
export const GET = route(async () => {
  const user = await requireUser();
  const [list, out] = await Promise.all([campaignsFor(user), optOutsOf(user.id)]);
  return json({
    items: list
      .filter((c) => c.role !== null)
      .map((c) => ({ campaignId: c.id, campaignName: c.name, receive: !out.has(c.id) })),
  } satisfies z.infer<typeof GetMyDigestResponse>);
});

/** Stops or resumes my own digest of one campaign of mine (audited). Answers the new setting. */
export const PUT = route(async (req) => {
  const user = await requireUser();
  const body = await parseJson(req, PutMyDigestBody);
  await requireCampaign(body.campaignId);
  if (body.receive) await optIn(user.id, body.campaignId);
  else await optOut(user.id, body.campaignId, "settings");
  return json({ campaignId: body.campaignId, receive: body.receive } satisfies z.infer<typeof PutMyDigestResponse>);
});
