import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses, experimentRuns, experiments, plateRuns, type ExperimentSettings } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import type { ExperimentKind } from "@/lib/analysis/kinds";
import { audit } from "../audit";
import type { Campaign } from "../campaigns";

export type Experiment = typeof experiments.$inferSelect;

/** An experiment: plate runs of this campaign analysed together, of one kind. */
export async function createExperiment(
  actor: Actor,
  campaign: Campaign,
  input: { name: string; kind: ExperimentKind; runIds: string[]; settings?: ExperimentSettings },
): Promise<{ id: string }> {
  const runIds = [...new Set(input.runIds)];
  if (runIds.length === 0) throw new AppError("bad_request", "Choose at least one plate run.");
  const runs = await db
    .select({ id: plateRuns.id })
    .from(plateRuns)
    .where(and(eq(plateRuns.campaignId, campaign.id), inArray(plateRuns.id, runIds)));
  const known = new Set(runs.map((r) => r.id));
  const missing = runIds.filter((id) => !known.has(id));
  if (missing.length)
    throw new AppError("bad_request", `These plate runs are not in this campaign: ${missing.join(", ")}`);
  return db.transaction(async (tx) => {
    const [e] = await tx
      .insert(experiments)
      .values({
        campaignId: campaign.id,
        name: input.name,
        kind: input.kind,
        settings: input.settings ?? {},
        createdBy: actor.id,
      })
      .returning({ id: experiments.id });
    await tx.insert(experimentRuns).values(runIds.map((runId) => ({ experimentId: e!.id, runId })));
    await audit(tx, actor, {
      campaignId: campaign.id,
      action: "experiment.create",
      entityType: "experiment",
      entityId: e!.id,
      after: { ...input, runIds },
    });
    return { id: e!.id };
  });
}

export async function getExperiment(campaignId: string, experimentId: string): Promise<Experiment> {
  if (!/^[0-9a-f-]{36}$/i.test(experimentId)) throw new AppError("not_found", "No such experiment.");
  const e = await db.query.experiments.findFirst({
    where: and(eq(experiments.id, experimentId), eq(experiments.campaignId, campaignId)),
  });
  if (!e) throw new AppError("not_found", "No such experiment.");
  return e;
}

/** The campaign's experiments, newest first, with run counts and their latest and current analyses. */
export async function listExperiments(campaignId: string) {
  const rows = await db
    .select({
      experiment: experiments,
      runs: sql<number>`(select count(*)::int from experiment_runs er where er.experiment_id = ${experiments.id})`,
      acceptedRuns: sql<number>`(select count(*)::int from experiment_runs er join plate_runs pr on pr.id = er.run_id where er.experiment_id = ${experiments.id} and pr.decision = 'accepted')`,
    })
    .from(experiments)
    .where(eq(experiments.campaignId, campaignId))
    .orderBy(desc(experiments.createdAt));
  const latest = rows.length
    ? await db
        .selectDistinctOn([analyses.experimentId])
        .from(analyses)
        .where(
          inArray(
            analyses.experimentId,
            rows.map((r) => r.experiment.id),
          ),
        )
        .orderBy(analyses.experimentId, desc(analyses.requestedAt))
    : [];
  const current = rows.length
    ? await db
        .select()
        .from(analyses)
        .where(
          and(
            inArray(
              analyses.experimentId,
              rows.map((r) => r.experiment.id),
            ),
            eq(analyses.isCurrent, true),
          ),
        )
    : [];
  return rows.map((r) => ({
    ...r,
    latest: latest.find((a) => a.experimentId === r.experiment.id) ?? null,
    current: current.find((a) => a.experimentId === r.experiment.id) ?? null,
  }));
}

/** The plate runs of an experiment (accepted or not), by file name. */
export async function experimentRunList(experimentId: string) {
  return db
    .select({
      id: plateRuns.id,
      fileName: plateRuns.fileName,
      barcode: plateRuns.barcode,
      decision: plateRuns.decision,
      qcVerdict: plateRuns.qcVerdict,
      zPrime: plateRuns.zPrime,
      sha256: plateRuns.sha256,
    })
    .from(experimentRuns)
    .innerJoin(plateRuns, eq(plateRuns.id, experimentRuns.runId))
    .where(eq(experimentRuns.experimentId, experimentId))
    .orderBy(asc(plateRuns.fileName));
}
