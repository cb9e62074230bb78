import "server-only";
import { asc, desc, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { digestSends } from "@/server/db/schema";

/** The campaign's digest sends, newest first: who, which week, status, attempts and errors. */
export async function sendLog(campaignId: string, limit = 100) {
  return db
    .select({
      id: digestSends.id,
      week: digestSends.week,
      email: digestSends.email,
      status: digestSends.status,
      attempts: digestSends.attempts,
      trigger: digestSends.trigger,
      messageId: digestSends.messageId,
      lastError: digestSends.lastError,
      createdAt: digestSends.createdAt,
      sentAt: digestSends.sentAt,
      nextAttemptAt: digestSends.nextAttemptAt,
    })
    .from(digestSends)
    .where(eq(digestSends.campaignId, campaignId))
    .orderBy(desc(digestSends.createdAt), asc(digestSends.email))
    .limit(limit);
}
