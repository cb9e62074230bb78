import "server-only";
import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns } from "@/server/db/schema";
import { AppError } from "@/server/errors";

export type Campaign = typeof campaigns.$inferSelect;

/** The campaign a digest is about, or a 404. */
export async function campaignById(campaignId: string): Promise<Campaign> {
  const [c] = await db.select().from(campaigns).where(eq(campaigns.id, campaignId));
  if (!c) throw new AppError("not_found", "No such campaign.");
  return c;
}
