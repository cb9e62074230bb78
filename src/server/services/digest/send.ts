import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns, digestOptOuts, digestSends, memberships, users } from "@/server/db/schema";
import { sendMail } from "@/server/mail/client";
import type { DigestData } from "@/server/mail/digest-email";
import type { Actor } from "@/server/auth/actor";
import { audit } from "../audit";
import { campaignById } from "./campaign";
import { gatherDigest, renderDigest } from "./content";
import { digestDue, digestWeek } from "./week";

/** Retry delays after a failed send: 1, 5, 30 minutes, then the next tick of the schedule (common practice). */
export const RETRY_DELAYS_MS = [60_000, 5 * 60_000, 30 * 60_000];
export const MAX_ATTEMPTS = 4;

/** Members who get the digest: every member of the campaign who has not stopped it. */
export async function recipients(campaignId: string) {
  return db
    .select({ id: users.id, email: users.email, name: users.name })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(
      and(
        eq(memberships.campaignId, campaignId),
        sql`not exists (select 1 from digest_opt_outs o where o.campaign_id = ${campaignId} and o.user_id = ${users.id})`,
      ),
    )
    .orderBy(asc(users.email));
}

export type SendSummary = {
  week: string;
  sent: number;
  alreadySent: number;
  failed: number;
  optedOut: number;
  inProgress: number;
};

/**
 * Sends this week's digest of a campaign to every recipient who has not had it. One row per
 * (campaign, recipient, week) is claimed with a conditional UPDATE, so two workers, a retry and
 * a second "send now" cannot send twice; the same key is the e-mail API's idempotency key.
 */
export async function sendCampaignDigest(
  campaignId: string,
  opts: { trigger: "schedule" | "send-now" | "retry"; now?: Date; actor?: Actor | null } = { trigger: "schedule" },
): Promise<SendSummary> {
  const now = opts.now ?? new Date();
  const campaign = await campaignById(campaignId);
  const week = digestWeek(now, campaign.timeZone);
  const people = await recipients(campaignId);
  const [{ n: optedOut } = { n: 0 }] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(digestOptOuts)
    .where(eq(digestOptOuts.campaignId, campaignId));
  const summary: SendSummary = { week, sent: 0, alreadySent: 0, failed: 0, optedOut, inProgress: 0 };
  if (people.length === 0) return summary;
  await db
    .insert(digestSends)
    .values(
      people.map((p) => ({
        campaignId,
        userId: p.id,
        week,
        email: p.email,
        idempotencyKey: `digest/${campaignId}/${p.id}/${week}`,
        trigger: opts.trigger,
      })),
    )
    .onConflictDoNothing();
  let data: DigestData | null = null;
  for (const p of people) {
    // Claim: only a pending row, a failed one whose retry time has come, or one stuck in
    // "sending" for 10 minutes (a worker that died mid-send) can be taken, by one caller.
    const [claimed] = await db
      .update(digestSends)
      .set({ status: "sending", claimedAt: now, attempts: sql`${digestSends.attempts} + 1` })
      .where(
        and(
          eq(digestSends.campaignId, campaignId),
          eq(digestSends.userId, p.id),
          eq(digestSends.week, week),
          sql`(${digestSends.status} = 'pending'
            or (${digestSends.status} = 'failed' and ${digestSends.attempts} < ${MAX_ATTEMPTS} and (${digestSends.nextAttemptAt} is null or ${digestSends.nextAttemptAt} <= ${now.toISOString()}::timestamptz))
            or (${digestSends.status} = 'sending' and ${digestSends.claimedAt} < ${new Date(now.getTime() - 10 * 60_000).toISOString()}::timestamptz))`,
        ),
      )
      .returning();
    if (!claimed) {
      const [row] = await db
        .select({ status: digestSends.status })
        .from(digestSends)
        .where(and(eq(digestSends.campaignId, campaignId), eq(digestSends.userId, p.id), eq(digestSends.week, week)));
      if (row?.status === "sent") summary.alreadySent += 1;
      else if (row?.status === "failed") summary.failed += 1;
      else summary.inProgress += 1;
      continue;
    }
    // Only this claim may settle the row: a sender presumed dead (its claim taken over after 10
    // minutes) that finishes late must not overwrite the newer claim's outcome.
    const mine = and(eq(digestSends.id, claimed.id), eq(digestSends.attempts, claimed.attempts));
    try {
      data ??= await gatherDigest(campaign, now);
      const mail = await renderDigest(data, p);
      const { id } = await sendMail({
        to: p.email,
        subject: mail.subject,
        html: mail.html,
        text: mail.text,
        idempotencyKey: claimed.idempotencyKey,
      });
      await db
        .update(digestSends)
        .set({ status: "sent", messageId: id, sentAt: new Date(), lastError: null })
        .where(mine);
      summary.sent += 1;
    } catch (e) {
      const delay = RETRY_DELAYS_MS[Math.min(claimed.attempts - 1, RETRY_DELAYS_MS.length - 1)]!;
      await db
        .update(digestSends)
        .set({
          status: "failed",
          lastError: e instanceof Error ? e.message.slice(0, 500) : String(e).slice(0, 500),
          nextAttemptAt: new Date(now.getTime() + delay),
        })
        .where(mine);
      summary.failed += 1;
    }
  }
  if (opts.actor && opts.trigger === "send-now") {
    await db.transaction((tx) =>
      audit(tx, opts.actor!, {
        campaignId,
        action: "digest.send_now",
        entityType: "campaign",
        entityId: campaignId,
        after: summary,
      }),
    );
  }
  return summary;
}

/** The schedule's tick: every campaign whose digest is due this week gets it (idempotent). */
export async function sendDueDigests(now = new Date()): Promise<{ campaigns: number; sent: number }> {
  const all = await db.select().from(campaigns);
  let sent = 0;
  let n = 0;
  for (const c of all) {
    if (!digestDue(c, now)) continue;
    n += 1;
    const s = await sendCampaignDigest(c.id, { trigger: "schedule", now });
    sent += s.sent;
  }
  // Retries of failed sends of earlier ticks in this week.
  return { campaigns: n, sent };
}
