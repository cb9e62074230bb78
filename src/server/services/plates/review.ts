import "server-only";
import { and, eq, inArray, isNull, or, sql } from "drizzle-orm";
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

/** One well to mask (`masked: true`) or unmask, with its reason. */
export type MaskEdit = { runId: string; well: string; masked: boolean; reason: string };

/** At most this many wells change in one request (a curve has tens of wells, a plate hundreds). */
const MAX_EDITS = 400;

/** Refuses a well that is not a sample of `compoundId` (a curve's point cannot reach a control well). */
async function checkCompoundWell(tx: Tx, runId: string, well: string, compoundId: string) {
  const [reading] = await tx
    .select({ role: wellReadings.role, compoundId: wellReadings.compoundId })
    .from(wellReadings)
    .where(and(eq(wellReadings.runId, runId), eq(wellReadings.well, well)));
  if (!reading) throw new AppError("not_found", `Well ${well.slice(0, 4)} has no reading on this run.`);
  if (reading.role !== "sample" || reading.compoundId !== compoundId)
    throw new AppError("bad_request", `Well ${well} does not hold ${compoundId.slice(0, 40)} on this run.`);
}

/**
 * Mask or unmask several wells, on one or more runs, in one transaction: every reason checked
 * first, runs locked in a fixed order, each mask row written and its reading's flag set, QC and
 * % inhibition recomputed once per run, one audit row per well. Any refusal (a reason missing, a
 * well already masked, a well of another compound when `compoundId` is given) writes nothing.
 * Returns the recomputed QC of each run touched.
 */
export async function changeMasks(
  actor: Actor,
  campaignId: string,
  edits: readonly MaskEdit[],
  opts: { compoundId?: string } = {},
): Promise<Map<string, RunQc>> {
  if (edits.length === 0) throw new AppError("bad_request", "No well to change.");
  if (edits.length > MAX_EDITS) throw new AppError("bad_request", `At most ${MAX_EDITS} wells change at once.`);
  const checked = edits.map((e) => ({
    ...e,
    why: checkReason(e.reason, e.masked ? "masking a well" : "unmasking a well"),
  }));
  const runIds = [...new Set(checked.map((e) => e.runId))].sort();
  return db.transaction(async (tx) => {
    const out = new Map<string, RunQc>();
    for (const runId of runIds) {
      const run = await lockRun(tx, campaignId, runId);
      const seen = new Set<string>();
      const done: { well: string; masked: boolean; why: string }[] = [];
      for (const e of checked.filter((x) => x.runId === runId)) {
        const well = canonicalWell(e.well, run.format) ?? e.well.trim().toUpperCase();
        if (seen.has(well)) throw new AppError("bad_request", `Well ${well} is listed twice.`);
        seen.add(well);
        if (opts.compoundId !== undefined) await checkCompoundWell(tx, runId, well, opts.compoundId);
        await (e.masked ? openMask : closeMask).record({ tx, runId, well, why: e.why, actorId: actor.id });
        await tx
          .update(wellReadings)
          .set({ masked: e.masked })
          .where(and(eq(wellReadings.runId, runId), eq(wellReadings.well, well)));
        done.push({ well, masked: e.masked, why: e.why });
      }
      const qc = await recompute(tx, runId);
      for (const d of done)
        await audit(tx, actor, {
          campaignId,
          action: d.masked ? "plate_run.mask" : "plate_run.unmask",
          entityType: "plate_run",
          entityId: runId,
          before: { well: d.well, zPrime: run.zPrime, verdict: run.qcVerdict },
          after: { well: d.well, zPrime: qc.zPrime, verdict: qc.verdict },
          reason: d.why,
        });
      out.set(runId, qc);
    }
    return out;
  });
}

/** One well masked or unmasked: `changeMasks` with a single edit, returning that run's QC. */
async function changeMask(masked: boolean, ...[actor, campaignId, runId, wellName, reason]: MaskArgs): Promise<RunQc> {
  const qcs = await changeMasks(actor, campaignId, [{ runId, well: wellName, masked, reason }]);
  return qcs.get(runId)!;
}

/** Mask one well with a reason (audited); QC and % inhibition are recomputed in the same transaction. */
export const maskWell = (...args: MaskArgs): Promise<RunQc> => changeMask(true, ...args);

/** Unmask a well (the mask row is closed, not deleted); QC and % inhibition are recomputed. */
export const unmaskWell = (...args: MaskArgs): Promise<RunQc> => changeMask(false, ...args);

/** A masked well of one compound with what a curve needs to draw it and put it back. */
export type CompoundMaskedWell = {
  runId: string;
  well: string;
  reason: string;
  concentrationUm: number | null;
  substrateUm: number | null;
  inhibitionPct: number | null;
  /** Signal minus the mean of the run's blank wells that are not in `masks` (the mechanism fit's rate). */
  rate: number | null;
};

/**
 * The wells of `compoundId` among `masks` (masks of an analysis's inputs, or the open masks of
 * its runs), with their readings: the points a result page draws as left out and may restore.
 */
export async function compoundMaskedWells(
  masks: readonly { runId: string; well: string; reason: string }[],
  compoundId: string,
): Promise<CompoundMaskedWell[]> {
  if (masks.length === 0) return [];
  const runIds = [...new Set(masks.map((m) => m.runId))];
  const reasons = new Map(masks.map((m) => [`${m.runId}|${m.well}`, m.reason]));
  const rows = await db
    .select({
      runId: wellReadings.runId,
      well: wellReadings.well,
      role: wellReadings.role,
      compoundId: wellReadings.compoundId,
      concentrationUm: wellReadings.concentrationUm,
      substrateUm: wellReadings.substrateUm,
      signal: wellReadings.signal,
      inhibitionPct: wellReadings.inhibitionPct,
    })
    .from(wellReadings)
    .where(
      and(
        inArray(wellReadings.runId, runIds),
        or(eq(wellReadings.compoundId, compoundId), eq(wellReadings.role, "blank")),
      ),
    );
  const blanks = new Map<string, number[]>();
  for (const r of rows)
    if (r.role === "blank" && r.signal !== null && !reasons.has(`${r.runId}|${r.well}`))
      blanks.set(r.runId, [...(blanks.get(r.runId) ?? []), r.signal]);
  const background = (runId: string) => {
    const b = blanks.get(runId);
    return b && b.length ? b.reduce((s, v) => s + v, 0) / b.length : 0;
  };
  return rows
    .filter((r) => r.role === "sample" && r.compoundId === compoundId && reasons.has(`${r.runId}|${r.well}`))
    .map((r) => ({
      runId: r.runId,
      well: r.well,
      reason: reasons.get(`${r.runId}|${r.well}`)!,
      concentrationUm: r.concentrationUm,
      substrateUm: r.substrateUm,
      inhibitionPct: r.inhibitionPct,
      rate: r.signal === null ? null : r.signal - background(r.runId),
    }));
}

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
