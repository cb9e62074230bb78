import "server-only";
import { and, desc, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import { enqueueAnalysis } from "@/server/jobs/boss";
import { ENGINE_VERSION } from "@/lib/kinetics";
import { audit } from "../audit";
import type { Campaign } from "../campaigns";
import { getExperiment } from "./experiments";
import { currentInputs } from "./inputs";
import { runAnalysis, type Progress } from "./run";
import { requeueStaleAnalyses } from "./recover";

export type AnalysisRequest = { id: string; status: string; reused: boolean; attempts: number };

/**
 * The row of a request: the same inputs as the current (or a queued/running) analysis give that
 * analysis back, with no new rows; otherwise a queued analysis is created, audited.
 */
async function recordRequest(actor: Actor, campaign: Campaign, experimentId: string): Promise<AnalysisRequest> {
  const experiment = await getExperiment(campaign.id, experimentId);
  const { inputs, hash } = await currentInputs(campaign, experiment);
  if (inputs.runs.length === 0)
    throw new AppError("bad_request", "No accepted plate run in this experiment: accept runs that pass QC first.");
  // A running analysis whose worker died is queued again first, so it is never handed back as running.
  await requeueStaleAnalyses({ experimentId: experiment.id });
  return db.transaction(async (tx) => {
    // Serialise requests for one experiment so two clicks cannot queue the same work twice.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${experiment.id}))`);
    const [same] = await tx
      .select()
      .from(analyses)
      .where(
        and(
          eq(analyses.experimentId, experiment.id),
          eq(analyses.inputHash, hash),
          sql`(${analyses.isCurrent} or ${analyses.status} in ('queued','running'))`,
        ),
      )
      .orderBy(desc(analyses.requestedAt))
      .limit(1);
    if (same) return { id: same.id, status: same.status, reused: true, attempts: same.attempts };
    const [a] = await tx
      .insert(analyses)
      .values({
        experimentId: experiment.id,
        campaignId: campaign.id,
        engineVersion: ENGINE_VERSION,
        inputHash: hash,
        inputs,
        requestedBy: actor.id,
      })
      .returning({ id: analyses.id, status: analyses.status, attempts: analyses.attempts });
    await audit(tx, actor, {
      campaignId: campaign.id,
      action: "analysis.request",
      entityType: "analysis",
      entityId: a!.id,
      after: { experimentId, inputHash: hash },
    });
    return { id: a!.id, status: a!.status, reused: false, attempts: a!.attempts };
  });
}

/**
 * Asks for an analysis and, when it is queued, sends its background job (pg-boss; the worker
 * runs it). The job is sent after the row commits, so the worker always finds it. A queued
 * analysis asked for again is sent again under the same job id (pg-boss keeps one), which also
 * mends a send that failed the first time: no analysis stays queued without a job.
 */
export async function requestAnalysis(
  actor: Actor,
  campaign: Campaign,
  experimentId: string,
): Promise<AnalysisRequest> {
  const a = await recordRequest(actor, campaign, experimentId);
  if (a.status === "queued") await enqueueAnalysis(a.id, a.attempts);
  return a;
}

/**
 * Asks for an analysis and computes it here, without a background job: for the seed and
 * command-line entries, where no worker may be running yet. Throws what the computation throws.
 */
export async function analyseNow(
  actor: Actor,
  campaign: Campaign,
  experimentId: string,
  onProgress?: Progress,
): Promise<AnalysisRequest> {
  const a = await recordRequest(actor, campaign, experimentId);
  await runAnalysis(a.id, onProgress);
  return { ...a, status: "done" };
}
