import "server-only";
import crypto from "node:crypto";
import { and, asc, desc, eq, gte, lt, sql } from "drizzle-orm";
import { render } from "@react-email/components";
import { db } from "@/server/db/client";
import {
  analyses,
  auditLog,
  campaigns,
  compoundResults,
  compounds,
  digestOptOuts,
  digestSends,
  hitRows,
  memberships,
  plateRuns,
  users,
} from "@/server/db/schema";
import { sendMail } from "@/server/mail/client";
import { AppError } from "@/server/errors";
import { env } from "@/env";
import { DigestEmail, type DigestData } from "@/server/mail/digest-email";
import type { SessionUser } from "@/server/auth/session";
import { audit } from "./audit";

type Campaign = typeof campaigns.$inferSelect;
type Actor = Pick<SessionUser, "id" | "email">;

const DAY = 86_400_000;
/** Retry delays after a failed send: 1, 5, 30 minutes, then the next tick of the schedule (common practice). */
export const RETRY_DELAYS_MS = [60_000, 5 * 60_000, 30 * 60_000];
export const MAX_ATTEMPTS = 4;

// ---------------------------------------------------------------- time

/** The local date-time parts of an instant in a time zone (no library: Intl knows the zones). */
function localParts(now: Date, timeZone: string) {
  const f = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    weekday: "short",
    hourCycle: "h23",
  });
  const p = Object.fromEntries(f.formatToParts(now).map((x) => [x.type, x.value]));
  const weekday = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"].indexOf(p.weekday!) + 1; // ISO: Monday 1
  return { y: Number(p.year), m: Number(p.month), d: Number(p.day), hour: Number(p.hour), weekday };
}

function safeZone(tz: string): string {
  try {
    new Intl.DateTimeFormat("en-GB", { timeZone: tz });
    return tz;
  } catch {
    return "UTC";
  }
}

/** Monday (YYYY-MM-DD) of the ISO week that `now` falls in, in the campaign's time zone: the digest's week. */
export function digestWeek(now: Date, timeZone: string): string {
  const l = localParts(now, safeZone(timeZone));
  const monday = new Date(Date.UTC(l.y, l.m - 1, l.d) - (l.weekday - 1) * DAY);
  return monday.toISOString().slice(0, 10);
}

/** Is this week's digest due: on or after the campaign's weekday and hour (local), in the same ISO week. */
export function digestDue(c: Pick<Campaign, "timeZone" | "digestWeekday" | "digestHour">, now: Date): boolean {
  const l = localParts(now, safeZone(c.timeZone));
  return l.weekday > c.digestWeekday || (l.weekday === c.digestWeekday && l.hour >= c.digestHour);
}

// ---------------------------------------------------------------- signed opt-out links

function secret(): string {
  if (env.LINK_SIGNING_SECRET) return env.LINK_SIGNING_SECRET;
  if (env.INHIBITRACK_MODE === "production") throw new Error("LINK_SIGNING_SECRET must be set in production mode.");
  return "inhibitrack-local-development-link-secret";
}

const sign = (payload: string) => crypto.createHmac("sha256", secret()).update(payload).digest("base64url");

/** A token naming one person and one campaign, signed so it cannot be altered to name another. */
export function optOutToken(userId: string, campaignId: string): string {
  const payload = Buffer.from(JSON.stringify({ u: userId, c: campaignId, p: "digest-opt-out" })).toString("base64url");
  return `${payload}.${sign(payload)}`;
}

export function readOptOutToken(token: string): { userId: string; campaignId: string } | null {
  const [payload, sig] = token.split(".");
  if (!payload || !sig) return null;
  const expected = sign(payload);
  if (sig.length !== expected.length || !crypto.timingSafeEqual(Buffer.from(sig), Buffer.from(expected))) return null;
  try {
    const v = JSON.parse(Buffer.from(payload, "base64url").toString("utf8")) as { u?: string; c?: string; p?: string };
    return v.p === "digest-opt-out" && v.u && v.c ? { userId: v.u, campaignId: v.c } : null;
  } catch {
    return null;
  }
}

export async function optOut(userId: string, campaignId: string, via: "link" | "settings"): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.insert(digestOptOuts).values({ userId, campaignId, via }).onConflictDoNothing();
    const [u] = await tx.select({ email: users.email }).from(users).where(eq(users.id, userId));
    await audit(tx, u ? { id: userId, email: u.email } : null, {
      campaignId,
      action: "digest.opt_out",
      entityType: "user",
      entityId: userId,
      after: { via },
    });
  });
}

export async function optIn(userId: string, campaignId: string): Promise<void> {
  await db.transaction(async (tx) => {
    await tx
      .delete(digestOptOuts)
      .where(and(eq(digestOptOuts.userId, userId), eq(digestOptOuts.campaignId, campaignId)));
    const [u] = await tx.select({ email: users.email }).from(users).where(eq(users.id, userId));
    await audit(tx, u ? { id: userId, email: u.email } : null, {
      campaignId,
      action: "digest.opt_in",
      entityType: "user",
      entityId: userId,
    });
  });
}

export async function optOutsOf(userId: string): Promise<Set<string>> {
  const rows = await db
    .select({ c: digestOptOuts.campaignId })
    .from(digestOptOuts)
    .where(eq(digestOptOuts.userId, userId));
  return new Set(rows.map((r) => r.c));
}

// ---------------------------------------------------------------- content

/** What happened in the campaign in the 7 days before `now`. */
export async function gatherDigest(campaign: Campaign, now: Date): Promise<DigestData> {
  const to = now;
  const from = new Date(now.getTime() - 7 * DAY);
  const [regCount] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(compounds)
    .where(and(gte(compounds.registeredAt, from), lt(compounds.registeredAt, to)));
  const registered = await db
    .select({ registryId: compounds.registryId, name: compounds.name })
    .from(compounds)
    .where(and(gte(compounds.registeredAt, from), lt(compounds.registeredAt, to)))
    .orderBy(asc(compounds.registryId))
    .limit(15);
  const runs = await db
    .select({
      id: plateRuns.id,
      fileName: plateRuns.fileName,
      zPrime: plateRuns.zPrime,
      verdict: plateRuns.qcVerdict,
      decision: plateRuns.decision,
      qc: plateRuns.qc,
    })
    .from(plateRuns)
    .where(and(eq(plateRuns.campaignId, campaign.id), gte(plateRuns.uploadedAt, from), lt(plateRuns.uploadedAt, to)))
    .orderBy(asc(plateRuns.fileName));
  const fresh = and(
    eq(compoundResults.campaignId, campaign.id),
    eq(analyses.isCurrent, true),
    gte(analyses.finishedAt, from),
    lt(analyses.finishedAt, to),
  );
  const hits = await db
    .select({ compoundId: compoundResults.compoundId, pctInhibition: compoundResults.pctInhibition })
    .from(compoundResults)
    .innerJoin(analyses, eq(analyses.id, compoundResults.analysisId))
    .where(and(fresh, eq(compoundResults.kind, "single-dose"), eq(compoundResults.hit, true)))
    .orderBy(desc(compoundResults.pctInhibition));
  const mech = await db
    .select({
      compoundId: compoundResults.compoundId,
      mechanism: compoundResults.mechanism,
      label: compoundResults.mechanismLabel,
      kiUm: compoundResults.kiUm,
      experimentId: compoundResults.experimentId,
    })
    .from(compoundResults)
    .innerJoin(analyses, eq(analyses.id, compoundResults.analysisId))
    .where(and(fresh, eq(compoundResults.kind, "mechanism")))
    .orderBy(asc(compoundResults.kiUm));
  const triage = await db
    .select({
      entityId: auditLog.entityId,
      action: auditLog.action,
      by: auditLog.actorEmail,
      at: auditLog.at,
      before: auditLog.before,
      after: auditLog.after,
    })
    .from(auditLog)
    .where(
      and(
        eq(auditLog.campaignId, campaign.id),
        gte(auditLog.at, from),
        lt(auditLog.at, to),
        sql`(${auditLog.action} ilike 'triage%' or ${auditLog.action} ilike 'hit.%')`,
      ),
    )
    .orderBy(desc(auditLog.at))
    .limit(50);
  // The top ten as the hit grid ranks them (clean before flagged or ambiguous, then Ki), from the
  // same table the grid reads, so the e-mail and the app agree (overrides included).
  const top = await db
    .select({
      compoundId: hitRows.compoundId,
      mechanism: hitRows.mechanism,
      kiUm: hitRows.kiUm,
      flagged: hitRows.flagged,
      ic50Um: hitRows.ic50Um,
    })
    .from(hitRows)
    .where(and(eq(hitRows.campaignId, campaign.id), sql`${hitRows.kiUm} is not null`))
    .orderBy(asc(hitRows.flagged), asc(hitRows.kiUm), asc(hitRows.compoundId))
    .limit(10);
  const describe = (t: (typeof triage)[number]) => {
    const b = t.before as { status?: string } | null;
    const a = t.after as { status?: string; comment?: string } | null;
    if (a?.status) return `${b?.status ?? "unreviewed"} → ${a.status}${a.comment ? `: “${a.comment}”` : ""}`;
    return t.action;
  };
  return {
    campaign: { id: campaign.id, name: campaign.name, targetEnzyme: campaign.targetEnzyme },
    appUrl: env.APP_URL,
    from,
    to,
    week: digestWeek(now, campaign.timeZone),
    compoundsRegistered: registered,
    compoundsRegisteredTotal: regCount?.n ?? 0,
    runs: {
      total: runs.length,
      accepted: runs.filter((r) => r.decision === "accepted").length,
      failedQc: runs.filter((r) => r.verdict === "fail").length,
      failed: runs
        .filter((r) => r.verdict === "fail")
        .map((r) => ({ id: r.id, fileName: r.fileName, zPrime: r.zPrime, reason: r.qc.reasons[0] ?? null })),
    },
    newHits: hits,
    mechanismCalls: mech,
    triage: triage.map((t) => ({
      compoundId: (t.entityId ?? "").split("/").pop() ?? "",
      action: t.action,
      by: t.by,
      at: t.at,
      detail: describe(t),
    })),
    topTen: top,
  };
}

export async function renderDigest(d: DigestData, recipient: { id: string; name: string }) {
  const optOutUrl = `${env.APP_URL}/digest/stop/${optOutToken(recipient.id, d.campaign.id)}`;
  const el = DigestEmail({ d, recipientName: recipient.name, optOutUrl });
  const [html, text] = await Promise.all([render(el), render(el, { plainText: true })]);
  const subject = `Inhibitrack weekly digest · ${d.campaign.name} · week of ${d.week}`;
  return { subject, html, text, optOutUrl };
}

// ---------------------------------------------------------------- sending

async function campaignById(campaignId: string): Promise<Campaign> {
  const [c] = await db.select().from(campaigns).where(eq(campaigns.id, campaignId));
  if (!c) throw new AppError("not_found", "No such campaign.");
  return c;
}

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
        .where(eq(digestSends.id, claimed.id));
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
        .where(eq(digestSends.id, claimed.id));
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

export async function previewDigest(campaignId: string, viewer: { id: string; name: string }, now = new Date()) {
  const campaign = await campaignById(campaignId);
  const data = await gatherDigest(campaign, now);
  return renderDigest(data, viewer);
}

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
