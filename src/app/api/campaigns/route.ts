import { requireAdmin, requireUser, tokenExcludesCampaign } from "@/server/auth/guard";
import { campaignsFor, createCampaign } from "@/server/services/campaigns";
import { json, parseJson, route } from "@/server/http";
import { PostCampaignBody, PostCampaignResponse } from "./schema";
import type { z } from "zod";

export const dynamic = "force-dynamic";

/** The campaigns the user belongs to (an admin: all), with the user's role in each. */
export const GET = route(async () => {
  const user = await requireUser();
  // A token limited to chosen campaigns lists only those.
  const list = (await campaignsFor(user)).filter((c) => !tokenExcludesCampaign(c.id));
  return json({
    items: list.map((c) => ({
      id: c.id,
      name: c.name,
      targetEnzyme: c.targetEnzyme,
      role: c.role,
      createdAt: c.createdAt.toISOString(),
    })),
  });
});

/** Creates a campaign (administrators; audited). 201 `{ id, name, targetEnzyme }`; members are then invited. */
export const POST = route(async (req) => {
  await requireUser();
  const body = await parseJson(req, PostCampaignBody);
  const user = await requireAdmin();
  const id = await createCampaign(user, body);
  return json(
    { id, name: body.name, targetEnzyme: body.targetEnzyme } satisfies z.infer<typeof PostCampaignResponse>,
    201,
  );
});
