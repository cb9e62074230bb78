import "server-only";
import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns } from "@/server/db/schema";
import type { Actor } from "@/server/auth/actor";
import { audit } from "../audit";
import { campaignById } from "./campaign";

/** Sets the weekday, hour and time zone of the campaign's digest, with its audit row. */
export async function setSchedule(
  actor: Actor,
  campaignId: string,
  s: { digestWeekday: number; digestHour: number; timeZone: string },
) {
  const before = await campaignById(campaignId);
  await db.transaction(async (tx) => {
    await tx.update(campaigns).set(s).where(eq(campaigns.id, campaignId));
    await audit(tx, actor, {
      campaignId,
      action: "digest.schedule",
      entityType: "campaign",
      entityId: campaignId,
      before: { digestWeekday: before.digestWeekday, digestHour: before.digestHour, timeZone: before.timeZone },
      after: s,
    });
  });
}
