import "server-only";
import { and, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns, memberships } from "@/server/db/schema";
import { optOut, readOptOutToken } from "./opt-out";

/** What the stop page may show: the campaign's name only (no address: the link may be forwarded). */
export type StopLinkTarget = { campaignName: string };

/**
 * The person and campaign of a stop link, when it is validly signed, unexpired, and the person is
 * still a member of the campaign; null otherwise (the page then says the link is not valid).
 */
async function liveTarget(token: string): Promise<{ userId: string; campaignId: string; campaignName: string } | null> {
  const who = readOptOutToken(token);
  if (!who) return null;
  const [row] = await db
    .select({ campaignName: campaigns.name })
    .from(memberships)
    .innerJoin(campaigns, eq(campaigns.id, memberships.campaignId))
    .where(and(eq(memberships.userId, who.userId), eq(memberships.campaignId, who.campaignId)));
  return row ? { ...who, campaignName: row.campaignName } : null;
}

/** For the page that confirms a stop link: which campaign it stops, or null when the link is not valid. */
export async function stopLinkTarget(token: string): Promise<StopLinkTarget | null> {
  const t = await liveTarget(token);
  return t ? { campaignName: t.campaignName } : null;
}

/** Stops the digest a valid link names; false when the link is not valid (forged, expired, no longer a member). */
export async function stopDigestByLink(token: string): Promise<boolean> {
  const t = await liveTarget(token);
  if (!t) return false;
  await optOut(t.userId, t.campaignId, "link");
  return true;
}
