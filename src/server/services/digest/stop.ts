import "server-only";
import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns, users } from "@/server/db/schema";
import { readOptOutToken } from "./opt-out";

export type StopLinkTarget = { email: string | null; campaignName: string | null };

/**
 * Whom and which campaign a digest stop link names, for the page that confirms it: null when the
 * link is not valid; a field is null when its person or campaign no longer exists.
 */
export async function stopLinkTarget(token: string): Promise<StopLinkTarget | null> {
  const who = readOptOutToken(token);
  if (!who) return null;
  const [[u], [c]] = await Promise.all([
    db.select({ email: users.email }).from(users).where(eq(users.id, who.userId)),
    db.select({ name: campaigns.name }).from(campaigns).where(eq(campaigns.id, who.campaignId)),
  ]);
  return { email: u?.email ?? null, campaignName: c?.name ?? null };
}
