import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { listViews, saveView } from "@/server/services/hits";
import { postBody } from "./schema";

export const dynamic = "force-dynamic";

/** The signed-in person's saved views of this campaign's hit grid (members). */
export const GET = route<{ campaignId: string }>(async (_req, { campaignId }) => {
  const { user } = await requireCampaign(campaignId);
  return json({ items: await listViews(user.id, campaignId) });
});

/** Saves a named view `{ name, state: { columns, query } }` for oneself (members); the same name replaces it. */
export const POST = route<{ campaignId: string }>(async (req, { campaignId }) => {
  const { user } = await requireCampaign(campaignId);
  const body = await parseJson(req, postBody);
  return json(await saveView(user.id, campaignId, body.name, body.state), 201);
});
