import "server-only";
import { and, asc, desc, eq, gte, lt, sql } from "drizzle-orm";
import { render } from "@react-email/components";
import { z } from "zod";
import { db } from "@/server/db/client";
import { analyses, auditLog, compoundResults, compounds, hitRows, plateRuns } from "@/server/db/schema";
import { env } from "@/env";
import { mechanismLabelNote } from "@/lib/hits/mechanism-label";
import { DigestEmail, type DigestData } from "@/server/mail/digest-email";
import { campaignById, type Campaign } from "./campaign";
import { optOutToken } from "./opt-out";
import { DAY, digestWeek } from "./week";

/** The status (and comment) an audit row of a triage change records before or after it. */
const statusChangeSchema = z.object({ status: z.string().optional(), comment: z.string().optional() });
const statusChange = (v: unknown) => {
  const r = statusChangeSchema.safeParse(v);
  return r.success ? r.data : null;
};

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
      flags: compoundResults.flags,
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
      mechanismLabel: hitRows.mechanismLabel,
      flags: hitRows.flags,
      kiUm: hitRows.kiUm,
      flagged: hitRows.flagged,
      ic50Um: hitRows.ic50Um,
    })
    .from(hitRows)
    .where(and(eq(hitRows.campaignId, campaign.id), sql`${hitRows.kiUm} is not null`))
    .orderBy(asc(hitRows.flagged), asc(hitRows.kiUm), asc(hitRows.compoundId))
    .limit(10);
  const describe = (t: (typeof triage)[number]) => {
    const b = statusChange(t.before);
    const a = statusChange(t.after);
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
    // "inadequate" and "ambiguous" are said in words with why, as on the hit grid.
    mechanismCalls: mech.map(({ flags, ...m }) => ({ ...m, note: mechanismLabelNote(m.label, flags)?.why ?? null })),
    triage: triage.map((t) => ({
      compoundId: (t.entityId ?? "").split("/").pop() ?? "",
      action: t.action,
      by: t.by,
      at: t.at,
      detail: describe(t),
    })),
    topTen: top.map(({ flags, mechanismLabel, ...t }) => ({
      ...t,
      inadequate: mechanismLabel === "inadequate",
      note: mechanismLabelNote(mechanismLabel, flags)?.why ?? null,
    })),
  };
}

/** One member's e-mail: subject, HTML, plain text and their signed opt-out link. */
export async function renderDigest(d: DigestData, recipient: { id: string; name: string }) {
  const optOutUrl = `${env.APP_URL}/digest/stop/${optOutToken(recipient.id, d.campaign.id)}`;
  const el = DigestEmail({ d, recipientName: recipient.name, optOutUrl });
  const [html, text] = await Promise.all([render(el), render(el, { plainText: true })]);
  const subject = `Inhibitrack weekly digest · ${d.campaign.name} · week of ${d.week}`;
  return { subject, html, text, optOutUrl };
}

/** The digest as a member would get it this week, rendered, not sent. */
export async function previewDigest(campaignId: string, viewer: { id: string; name: string }, now = new Date()) {
  const campaign = await campaignById(campaignId);
  const data = await gatherDigest(campaign, now);
  return renderDigest(data, viewer);
}
