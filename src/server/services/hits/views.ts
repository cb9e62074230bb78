import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { hitViews } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { SavedViewState } from "@/lib/hits/query";

/** The user's saved views of the campaign's grid, by name. */
export async function listViews(userId: string, campaignId: string) {
  const rows = await db
    .select()
    .from(hitViews)
    .where(and(eq(hitViews.userId, userId), eq(hitViews.campaignId, campaignId)))
    .orderBy(asc(sql`lower(${hitViews.name})`));
  return rows.map((v) => ({
    id: v.id,
    name: v.name,
    state: v.state as SavedViewState,
    updatedAt: v.updatedAt.toISOString(),
  }));
}

/** Saves a named view for the user (a view of the same name is replaced). */
export async function saveView(userId: string, campaignId: string, name: string, state: SavedViewState) {
  // The unique index is on lower(name): drizzle's onConflict target takes columns only.
  const [v] = await db.execute<{ id: string }>(sql`
    insert into hit_views (user_id, campaign_id, name, state) values (${userId}, ${campaignId}, ${name}, ${JSON.stringify(state)}::jsonb)
    on conflict (user_id, campaign_id, lower(name)) do update set state = excluded.state, name = excluded.name, updated_at = now()
    returning id`);
  return { id: v!.id };
}

export async function deleteView(userId: string, campaignId: string, viewId: string) {
  if (!/^[0-9a-f-]{36}$/i.test(viewId)) throw new AppError("not_found", "No such view.");
  const gone = await db
    .delete(hitViews)
    .where(and(eq(hitViews.id, viewId), eq(hitViews.userId, userId), eq(hitViews.campaignId, campaignId)))
    .returning({ id: hitViews.id });
  if (gone.length === 0) throw new AppError("not_found", "No such view.");
}
