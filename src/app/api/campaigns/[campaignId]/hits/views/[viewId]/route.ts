import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { deleteView } from "@/server/services/hits";

export const dynamic = "force-dynamic";

/** Deletes one of one's own saved views (members; another person's view is not found). */
export const DELETE = route<{ campaignId: string; viewId: string }>(async (_req, { campaignId, viewId }) => {
  const { user } = await requireCampaign(campaignId);
  await deleteView(user.id, campaignId, viewId);
  return json({ ok: true });
});
