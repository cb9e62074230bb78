import { requireUser, tokenExcludesCampaign } from "@/server/auth/guard";
import { campaignsFor } from "@/server/services/campaigns";
import { json, route } from "@/server/http";

export const dynamic = "force-dynamic";

/** The signed-in user, their global role and their memberships. 401 JSON without a session. */
export const GET = route(async () => {
  const user = await requireUser();
  // A token limited to chosen campaigns lists only those.
  const list = (await campaignsFor(user)).filter((c) => !tokenExcludesCampaign(c.id));
  return json({
    user: { id: user.id, email: user.email, name: user.name },
    globalRole: user.globalRole,
    memberships: list
      .filter((c) => c.role !== null)
      .map((c) => ({ campaignId: c.id, campaignName: c.name, role: c.role })),
  });
});
