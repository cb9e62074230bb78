import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns, plateBatches, plateBatchFiles, plateRuns } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import { audit } from "../../audit";

type Campaign = typeof campaigns.$inferSelect;

/**
 * "Accept all that pass": every run of the batch whose QC passes and that nobody has decided yet
 * is accepted with the one reason, in one transaction with one audit row per run (the same
 * `plate_run.accept` the per-run decision writes). Runs that fail QC, and runs already accepted
 * or rejected, are left as they are and counted in the answer.
 */
export async function acceptPassing(
  actor: Actor,
  campaign: Campaign,
  batchId: string,
  reason: string,
): Promise<{ accepted: string[]; failing: number; alreadyDecided: number }> {
  const why = reason.trim();
  if (why.length < 3)
    throw new AppError("bad_request", "Give a reason for accepting the runs (at least 3 characters).");
  if (why.length > 500) throw new AppError("bad_request", "A reason has at most 500 characters.");
  return db.transaction(async (tx) => {
    const [b] = await tx
      .select({ id: plateBatches.id })
      .from(plateBatches)
      .where(and(eq(plateBatches.id, batchId), eq(plateBatches.campaignId, campaign.id)));
    if (!b) throw new AppError("not_found", "No such plate batch in this campaign.");
    const files = await tx
      .select({ runId: plateBatchFiles.runId })
      .from(plateBatchFiles)
      .where(and(eq(plateBatchFiles.batchId, batchId), eq(plateBatchFiles.outcome, "stored")));
    const ids = files.map((f) => f.runId).filter((x): x is string => !!x);
    if (ids.length === 0) return { accepted: [], failing: 0, alreadyDecided: 0 };
    // Locked in a fixed order, as the per-run decision locks its run, so a mask change or a
    // per-run decision at the same moment waits rather than interleaves.
    const runs = await tx
      .select({
        id: plateRuns.id,
        verdict: plateRuns.qcVerdict,
        decision: plateRuns.decision,
        zPrime: plateRuns.zPrime,
      })
      .from(plateRuns)
      .where(and(inArray(plateRuns.id, ids), eq(plateRuns.campaignId, campaign.id)))
      .orderBy(plateRuns.id)
      .for("update");
    const take = runs.filter((r) => r.verdict === "pass" && r.decision === "pending");
    if (take.length > 0) {
      await tx
        .update(plateRuns)
        .set({ decision: "accepted", decisionReason: why, decidedBy: actor.id, decidedAt: sql`now()` })
        .where(
          inArray(
            plateRuns.id,
            take.map((r) => r.id),
          ),
        );
      for (const r of take)
        await audit(tx, actor, {
          campaignId: campaign.id,
          action: "plate_run.accept",
          entityType: "plate_run",
          entityId: r.id,
          before: { decision: r.decision, verdict: r.verdict },
          after: { decision: "accepted", zPrime: r.zPrime, batchId },
          reason: why,
        });
    }
    return {
      accepted: take.map((r) => r.id),
      failing: runs.filter((r) => r.verdict !== "pass").length,
      alreadyDecided: runs.filter((r) => r.verdict === "pass" && r.decision !== "pending").length,
    };
  });
}
