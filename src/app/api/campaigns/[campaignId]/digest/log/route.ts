import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { sendLog } from "@/server/services/digest";

export const dynamic = "force-dynamic";

/** The digest send log of a campaign: one row per recipient and week, with attempts and errors. */
export const GET = route<{ campaignId: string }>(async (_req, { campaignId }) => {
  await requireCampaign(campaignId, "digest:send");
  const rows = await sendLog(campaignId);
  return json({
    items: rows.map((r) => ({
      ...r,
      createdAt: r.createdAt.toISOString(),
      sentAt: r.sentAt?.toISOString() ?? null,
      nextAttemptAt: r.nextAttemptAt?.toISOString() ?? null,
    })),
  });
});
