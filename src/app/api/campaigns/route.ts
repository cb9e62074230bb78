import { requireUser } from "@/server/auth/guard";
import { campaignsFor } from "@/server/services/campaigns";
import { json, route } from "@/server/http";

export const dynamic = "force-dynamic";

/** The campaigns the user belongs to (an admin: all), with the user's role in each. */
export const GET = route(async () => {
  const user = await requireUser();
  const list = await campaignsFor(user);
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
