import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import { db } from "@/server/db/client";
import { experimentRuns, experiments, plateRuns, type ExperimentSettings } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import { audit } from "../audit";
import type { Campaign } from "../campaigns";

/**
 * Change an experiment's plate runs (the whole set is replaced) and/or its settings (replaced as
 * given), audited with before and after in one transaction. Analyses already made keep their own
 * inputs; the next analysis uses the new ones (its input hash differs, so it is not reused).
 */
export async function updateExperiment(
  actor: Actor,
  campaign: Campaign,
  experimentId: string,
  input: { runIds?: string[]; settings?: ExperimentSettings },
): Promise<{ id: string; runIds: string[]; settings: ExperimentSettings }> {
  if (input.runIds === undefined && input.settings === undefined)
    throw new AppError("bad_request", "Nothing to change: give runIds, settings or both.");
  const runIds = input.runIds === undefined ? undefined : [...new Set(input.runIds)];
  if (runIds !== undefined && runIds.length === 0) throw new AppError("bad_request", "Choose at least one plate run.");
  return db.transaction(async (tx) => {
    const [old] = await tx
      .select()
      .from(experiments)
      .where(and(eq(experiments.id, experimentId), eq(experiments.campaignId, campaign.id)))
      .for("update");
    if (!old) throw new AppError("not_found", "No such experiment.");
    const before = (
      await tx
        .select({ runId: experimentRuns.runId })
        .from(experimentRuns)
        .where(eq(experimentRuns.experimentId, experimentId))
        .orderBy(asc(experimentRuns.runId))
    ).map((r) => r.runId);
    if (runIds !== undefined) {
      const known = new Set(
        (
          await tx
            .select({ id: plateRuns.id })
            .from(plateRuns)
            .where(and(eq(plateRuns.campaignId, campaign.id), inArray(plateRuns.id, runIds)))
        ).map((r) => r.id),
      );
      const missing = runIds.filter((id) => !known.has(id));
      if (missing.length)
        throw new AppError(
          "bad_request",
          `These plate runs are not in this campaign: ${missing.slice(0, 10).join(", ")}${missing.length > 10 ? ` (and ${missing.length - 10} more)` : ""}`,
        );
      await tx.delete(experimentRuns).where(eq(experimentRuns.experimentId, experimentId));
      await tx.insert(experimentRuns).values(runIds.map((runId) => ({ experimentId, runId })));
    }
    const settings = input.settings ?? old.settings;
    if (input.settings !== undefined)
      await tx.update(experiments).set({ settings }).where(eq(experiments.id, experimentId));
    const after = runIds === undefined ? before : [...runIds].sort();
    await audit(tx, actor, {
      campaignId: campaign.id,
      action: "experiment.update",
      entityType: "experiment",
      entityId: experimentId,
      before: { runIds: before, settings: old.settings },
      after: { runIds: after, settings },
    });
    return { id: experimentId, runIds: after, settings };
  });
}
