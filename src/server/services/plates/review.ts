import "server-only";
import { and, eq, isNull, sql } from "drizzle-orm";
import { db, type Tx } from "@/server/db/client";
import { campaigns, plateMaps, plateRuns, plateWellMasks, wellReadings } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import { canonicalWell } from "@/lib/plates/geometry";
import { computeRunQc, type RunQc } from "@/lib/plates/run-qc";
import { audit } from "../audit";

/** Recompute QC and % inhibition of a run from its stored readings and open masks (inside tx). */
async function recompute(tx: Tx, runId: string): Promise<RunQc> {
  const [head] = await tx
    .select({
      readout: plateRuns.readout,
      direction: plateMaps.signalDirection,
      minZPrime: campaigns.qcMinZPrime,
      maxCvPct: campaigns.qcMaxCvPct,
    })
    .from(plateRuns)
    .innerJoin(plateMaps, eq(plateMaps.id, plateRuns.plateMapId))
    .innerJoin(campaigns, eq(campaigns.id, plateRuns.campaignId))
    .where(eq(plateRuns.id, runId));
  const rows = await tx
    .select({
      well: wellReadings.well,
      role: wellReadings.role,
      signal: wellReadings.signal,
      isEdge: wellReadings.isEdge,
      masked: wellReadings.masked,
      rateLinear: wellReadings.rateLinear,
    })
    .from(wellReadings)
    .where(eq(wellReadings.runId, runId));
  const { qc, inhibitionPct } = computeRunQc(rows, {
    readout: head!.readout === "kinetic" ? "kinetic" : "endpoint",
    direction: head!.direction,
    minZPrime: head!.minZPrime,
    maxCvPct: head!.maxCvPct,
  });
  const values = JSON.stringify([...inhibitionPct].map(([well, p]) => ({ well, p })));
  await tx.execute(sql`
    update ${wellReadings} as w set inhibition_pct = v.p
    from jsonb_to_recordset(${values}::jsonb) as v(well text, p double precision)
    where w.run_id = ${runId} and w.well = v.well`);
  await tx.update(plateRuns).set({ qc, zPrime: qc.zPrime, qcVerdict: qc.verdict }).where(eq(plateRuns.id, runId));
  return qc;
}

async function lockRun(tx: Tx, campaignId: string, runId: string) {
  const [run] = await tx
    .select()
    .from(plateRuns)
    .where(and(eq(plateRuns.id, runId), eq(plateRuns.campaignId, campaignId)))
    .for("update");
  if (!run) throw new AppError("not_found", "No such plate run in this campaign.");
  return run;
}

function checkReason(reason: string, what: string): string {
  const r = reason.trim();
  if (r.length < 3) throw new AppError("bad_request", `Give a reason for ${what} (at least 3 characters).`);
  if (r.length > 500) throw new AppError("bad_request", "A reason has at most 500 characters.");
  return r;
}

type MaskArgs = [actor: Actor, campaignId: string, runId: string, wellName: string, reason: string];

type MaskStep = { tx: Tx; runId: string; well: string; why: string; actorId: string };

/** Opens a mask row (the well must have an unmasked reading) or closes the open one. */
type MaskChange = { masked: boolean; record: (step: MaskStep) => Promise<void> };

const openMask: MaskChange = {
  masked: true,
  async record({ tx, runId, well, why, actorId }) {
    const [reading] = await tx
      .select({ masked: wellReadings.masked })
      .from(wellReadings)
      .where(and(eq(wellReadings.runId, runId), eq(wellReadings.well, well)));
    if (!reading) throw new AppError("not_found", `Well ${well.slice(0, 4)} has no reading on this run.`);
    if (reading.masked) throw new AppError("conflict", `Well ${well} is already masked.`);
    await tx.insert(plateWellMasks).values({ runId, well, reason: why, maskedBy: actorId });
  },
};

// The mask row is closed, not deleted, so the history of a well stays readable.
const closeMask: MaskChange = {
  masked: false,
  async record({ tx, runId, well, why, actorId }) {
    const closed = await tx
      .update(plateWellMasks)
      .set({ unmaskedAt: new Date(), unmaskedBy: actorId, unmaskReason: why })
      .where(and(eq(plateWellMasks.runId, runId), eq(plateWellMasks.well, well), isNull(plateWellMasks.unmaskedAt)))
      .returning({ id: plateWellMasks.id });
    if (closed.length === 0) throw new AppError("conflict", `Well ${well.slice(0, 4)} is not masked.`);
  },
};

/**
 * Mask or unmask one well: reason checked, run locked, the mask row written, the reading's flag
 * set, QC and % inhibition recomputed and the change audited, all in one transaction.
 */
async function changeMask(
  change: MaskChange,
  ...[actor, campaignId, runId, wellName, reason]: MaskArgs
): Promise<RunQc> {
  const why = checkReason(reason, change.masked ? "masking a well" : "unmasking a well");
  return db.transaction(async (tx) => {
    const run = await lockRun(tx, campaignId, runId);
    const well = canonicalWell(wellName, run.format) ?? wellName.trim().toUpperCase();
    await change.record({ tx, runId, well, why, actorId: actor.id });
    await tx
      .update(wellReadings)
      .set({ masked: change.masked })
      .where(and(eq(wellReadings.runId, runId), eq(wellReadings.well, well)));
    const qc = await recompute(tx, runId);
    await audit(tx, actor, {
      campaignId,
      action: change.masked ? "plate_run.mask" : "plate_run.unmask",
      entityType: "plate_run",
      entityId: runId,
      before: { well, zPrime: run.zPrime, verdict: run.qcVerdict },
      after: { well, zPrime: qc.zPrime, verdict: qc.verdict },
      reason: why,
    });
    return qc;
  });
}

/** Mask one well with a reason (audited); QC and % inhibition are recomputed in the same transaction. */
export const maskWell = (...args: MaskArgs): Promise<RunQc> => changeMask(openMask, ...args);

/** Unmask a well (the mask row is closed, not deleted); QC and % inhibition are recomputed. */
export const unmaskWell = (...args: MaskArgs): Promise<RunQc> => changeMask(closeMask, ...args);

/**
 * Accept or reject a run with a reason (audited). A run that fails QC cannot be accepted: its
 * numbers must not count until the wells at fault are masked (with reasons) and QC passes.
 */
export async function decideRun(
  actor: Actor,
  campaignId: string,
  runId: string,
  decision: "accepted" | "rejected",
  reason: string,
): Promise<void> {
  const why = checkReason(reason, decision === "accepted" ? "accepting the run" : "rejecting the run");
  await db.transaction(async (tx) => {
    const run = await lockRun(tx, campaignId, runId);
    if (decision === "accepted" && run.qcVerdict !== "pass") {
      throw new AppError(
        "conflict",
        `This run fails QC (${run.qc.reasons[0] ?? "see the QC panel"}), so it cannot be accepted. Mask the wells at fault with a reason, or reject the run.`,
      );
    }
    await tx
      .update(plateRuns)
      .set({ decision, decisionReason: why, decidedBy: actor.id, decidedAt: new Date() })
      .where(eq(plateRuns.id, runId));
    await audit(tx, actor, {
      campaignId,
      action: decision === "accepted" ? "plate_run.accept" : "plate_run.reject",
      entityType: "plate_run",
      entityId: runId,
      before: { decision: run.decision, verdict: run.qcVerdict },
      after: { decision, zPrime: run.zPrime },
      reason: why,
    });
  });
}
