import "server-only";
import { and, eq, ne, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import { enqueueAnalysis, LIVENESS } from "@/server/jobs/boss";
import { audit } from "../audit";
import type { Campaign } from "../campaigns";
import { getAnalysis } from "./history";

export type Requeued = { id: string; attempts: number; status: "queued" | "failed" };

/**
 * Running analyses whose worker stopped beating (no heartbeat for LIVENESS.analysisStaleSeconds)
 * go back to the queue — or, after LIVENESS.maxAnalysisAttempts takes, to failed with the reason
 * — each exactly once: one conditional UPDATE … WHERE status = 'running' AND heartbeat_at < …
 * RETURNING, so of several workers (and requests) sweeping at once only one gets each row. The
 * change is audited (actor: the system) and a job for the next take is sent. Called by every
 * worker every LIVENESS.sweepMs and by a request for the experiment, so a stuck analysis is
 * never handed back as if it were running.
 */
export async function requeueStaleAnalyses(opts: { experimentId?: string } = {}): Promise<Requeued[]> {
  const staleBefore = sql`now() - make_interval(secs => ${LIVENESS.analysisStaleSeconds})`;
  const rows = await db.transaction(async (tx) => {
    const out = await tx
      .update(analyses)
      .set({
        status: sql`case when ${analyses.attempts} >= ${LIVENESS.maxAnalysisAttempts} then 'failed' else 'queued' end::analysis_status`,
        error: sql`case when ${analyses.attempts} >= ${LIVENESS.maxAnalysisAttempts} then ${`The worker stopped ${LIVENESS.maxAnalysisAttempts} times while running this analysis; retry it, or ask an administrator to look at the worker's log`} else null end`,
        finishedAt: sql`case when ${analyses.attempts} >= ${LIVENESS.maxAnalysisAttempts} then now() else null end`,
        progress: 0,
        heartbeatAt: null,
      })
      .where(
        and(
          eq(analyses.status, "running"),
          sql`coalesce(${analyses.heartbeatAt}, ${analyses.startedAt}, ${analyses.requestedAt}) < ${staleBefore}`,
          opts.experimentId ? eq(analyses.experimentId, opts.experimentId) : undefined,
        ),
      )
      .returning({
        id: analyses.id,
        campaignId: analyses.campaignId,
        attempts: analyses.attempts,
        status: analyses.status,
      });
    for (const r of out)
      await audit(tx, null, {
        campaignId: r.campaignId,
        action: r.status === "queued" ? "analysis.requeue" : "analysis.fail",
        entityType: "analysis",
        entityId: r.id,
        after: { attempts: r.attempts, status: r.status },
        reason: `no heartbeat from its worker for ${LIVENESS.analysisStaleSeconds} s`,
      });
    return out;
  });
  for (const r of rows) if (r.status === "queued") await enqueueAnalysis(r.id, r.attempts);
  return rows.map((r) => ({ id: r.id, attempts: r.attempts, status: r.status as "queued" | "failed" }));
}

/**
 * A person asks for a failed analysis to run again (same inputs): failed → queued in one
 * conditional UPDATE with its audit row, then a job for the next take. Refused (409) when the
 * analysis is not failed, or when a newer analysis of the experiment exists — retrying the old
 * one would make stale inputs current; ask for a new analysis instead.
 */
export async function retryAnalysis(
  actor: Actor,
  campaign: Campaign,
  experimentId: string,
  analysisId: string,
): Promise<{ id: string; status: "queued" }> {
  const a = await getAnalysis(campaign.id, analysisId);
  if (a.experimentId !== experimentId) throw new AppError("not_found", "No such analysis.");
  const attempts = await db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${experimentId}))`);
    const [newer] = await tx
      .select({ id: analyses.id })
      .from(analyses)
      // Compared in SQL: a JS Date keeps milliseconds, the column microseconds.
      .where(
        and(
          eq(analyses.experimentId, experimentId),
          ne(analyses.id, analysisId),
          sql`${analyses.requestedAt} > (select a2.requested_at from analyses a2 where a2.id = ${analysisId})`,
        ),
      )
      .limit(1);
    if (newer)
      throw new AppError(
        "conflict",
        "A newer analysis of this experiment exists; run the analysis again instead of retrying this one.",
      );
    const [row] = await tx
      .update(analyses)
      .set({ status: "queued", error: null, progress: 0, finishedAt: null, heartbeatAt: null })
      .where(and(eq(analyses.id, analysisId), eq(analyses.status, "failed")))
      .returning({ attempts: analyses.attempts });
    if (!row) throw new AppError("conflict", `Only a failed analysis can be retried; this one is ${a.status}.`);
    await audit(tx, actor, {
      campaignId: campaign.id,
      action: "analysis.retry",
      entityType: "analysis",
      entityId: analysisId,
      before: { status: "failed", error: a.error },
      after: { status: "queued" },
    });
    return row.attempts;
  });
  await enqueueAnalysis(analysisId, attempts);
  return { id: analysisId, status: "queued" };
}
