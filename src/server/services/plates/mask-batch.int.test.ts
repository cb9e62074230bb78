// Curation against the real Postgres: several wells masked or restored in one transaction
// (all or nothing, one audit row per well, QC recomputed), the result page's save action with its
// checks, and the next analysis's inputs (hash and masks) taking the change.
// Outside reference: the Z′ worked example of Zhang, Chung & Oldenburg (J Biomol Screen
// 1999;4:67–73) on controls 1000 ± 31.6 and 100 ± 7.07 (Z′ 0.87102, figures calculated with
// SciPy); the sample wells do not enter Z′, so masking them leaves it unchanged.
// The plate is INVENTED data (src/test/plates.ts).
import { describe, it, expect, beforeAll } from "vitest";
import { and, eq, isNull } from "drizzle-orm";
import { makeWorld, callAction, type World } from "@/test/harness";
import { campaignRow, smallExport, smallMap, registryIds } from "@/test/plates";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { db } from "@/server/db/client";
import { auditLog, plateWellMasks, wellReadings } from "@/server/db/schema";
import type { AppError } from "@/server/errors";
import { createExperiment, currentInputs, getExperiment, requestAnalysis, runAnalysis } from "../analyses";
import { experimentResults } from "../analyses";
import * as analysisActions from "@/app/(workspace)/campaigns/[campaignId]/analyses/actions";
import { changeMasks, compoundMaskedWells, createPlateMap, decideRun, uploadRun } from ".";

let w: World;
let runId: string;
beforeAll(async () => {
  w = await makeWorld();
  await ensureCompoundsRegistered(registryIds(12));
  const { id: mapId } = await createPlateMap(w.people.assay, w.campaignId, { name: "Curation map", map: smallMap() });
  const run = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
    plateMapId: mapId,
    fileName: "curation.csv",
    contentType: "text/csv",
    bytes: smallExport(31),
  });
  runId = run.id;
  await decideRun(w.people.assay, w.campaignId, runId, "accepted", "QC passes (test)");
});

const openMasks = () =>
  db
    .select()
    .from(plateWellMasks)
    .where(and(eq(plateWellMasks.runId, runId), isNull(plateWellMasks.unmaskedAt)));

describe("masking several wells at once", () => {
  it("writes nothing when one of the wells is refused", async () => {
    const e = (await changeMasks(w.people.assay, w.campaignId, [
      { runId, well: "C2", masked: true, reason: "bubble at read-out" },
      { runId, well: "C3", masked: false, reason: "was never masked" },
    ]).catch((x: unknown) => x)) as AppError;
    expect(e.status).toBe(409);
    expect(e.message).toBe("Well C3 is not masked.");
    expect(await openMasks()).toHaveLength(0);
    const [c2] = await db
      .select({ masked: wellReadings.masked })
      .from(wellReadings)
      .where(and(eq(wellReadings.runId, runId), eq(wellReadings.well, "C2")));
    expect(c2!.masked).toBe(false);
  });

  it("refuses a well of another compound or a control when the compound is named", async () => {
    for (const well of ["C3", "A1"]) {
      const e = (await changeMasks(
        w.people.assay,
        w.campaignId,
        [{ runId, well, masked: true, reason: "clicked on the curve" }],
        { compoundId: "INH-000002" },
      ).catch((x: unknown) => x)) as AppError;
      expect(e.status).toBe(400);
      expect(e.message).toBe(`Well ${well} does not hold INH-000002 on this run.`);
    }
    expect(await openMasks()).toHaveLength(0);
  });

  it("refuses a missing reason and a well listed twice", async () => {
    const noReason = (await changeMasks(w.people.assay, w.campaignId, [
      { runId, well: "C2", masked: true, reason: "  " },
    ]).catch((x: unknown) => x)) as AppError;
    expect(noReason.message).toBe("Give a reason for masking a well (at least 3 characters).");
    const twice = (await changeMasks(w.people.assay, w.campaignId, [
      { runId, well: "C2", masked: true, reason: "first" },
      { runId, well: "c02", masked: true, reason: "second" },
    ]).catch((x: unknown) => x)) as AppError;
    expect(twice.message).toBe("Well C2 is listed twice.");
  });

  it("masks two wells in one transaction, audited per well, QC recomputed once", async () => {
    const qcs = await changeMasks(w.people.assay, w.campaignId, [
      { runId, well: "C2", masked: true, reason: "bubble at read-out" },
      { runId, well: "C4", masked: true, reason: "dispensing error" },
    ]);
    const qc = qcs.get(runId)!;
    expect(qc.zPrime).toBeCloseTo(0.87102, 5);
    expect(qc.maskedWells).toBe(2);
    expect((await openMasks()).map((m) => [m.well, m.reason]).sort()).toEqual([
      ["C2", "bubble at read-out"],
      ["C4", "dispensing error"],
    ]);
    const audits = await db
      .select({ action: auditLog.action, reason: auditLog.reason })
      .from(auditLog)
      .where(and(eq(auditLog.entityId, runId), eq(auditLog.action, "plate_run.mask")));
    expect(audits.map((a) => a.reason).sort()).toEqual(["bubble at read-out", "dispensing error"]);
    const masked = await compoundMaskedWells(
      (await openMasks()).map((m) => ({ runId, well: m.well, reason: m.reason })),
      "INH-000002",
    );
    // smallExport: C2 reads 902; % inhibition = 100·(1000 − 902)/(1000 − 100).
    expect(masked).toHaveLength(1);
    expect(masked[0]!.well).toBe("C2");
    expect(masked[0]!.concentrationUm).toBe(10);
    expect(masked[0]!.inhibitionPct).toBeCloseTo((100 * (1000 - 902)) / 900, 10);
    expect(masked[0]!.rate).toBe(902); // no blank wells on this plate: no background
    await changeMasks(w.people.assay, w.campaignId, [
      { runId, well: "C2", masked: false, reason: "re-read: value is fine" },
      { runId, well: "C4", masked: false, reason: "re-read: value is fine" },
    ]);
    expect(await openMasks()).toHaveLength(0);
  });
});

describe("the result page's save action", () => {
  it("stores the exclusion, changes the input hash, and the next analysis leaves the well out", async () => {
    const campaign = await campaignRow(w.campaignId);
    const { id: experimentId } = await createExperiment(w.people.assay, campaign, {
      name: "Curation experiment",
      kind: "single-dose",
      runIds: [runId],
    });
    const experiment = await getExperiment(w.campaignId, experimentId);
    const first = await requestAnalysis(w.people.assay, campaign, experimentId);
    await runAnalysis(first.id);
    const before = await currentInputs(campaign, experiment);
    expect((await experimentResults(experimentId)).map((r) => r.compoundId)).toContain("INH-000001");

    const save = (user: World["people"]["assay"], edits: unknown, compoundId = "INH-000001") =>
      callAction(
        analysisActions.saveCurationAction,
        { campaignId: w.campaignId, experimentId, compoundId, edits: JSON.stringify(edits) },
        user,
      );
    const refused = await save(w.people.viewer, [{ runId, well: "C1", masked: true, reason: "viewer tries" }]);
    expect(refused.kind === "state" && refused.state?.ok === false && refused.state.status).toBe(403);
    const noReason = await save(w.people.assay, [{ runId, well: "C1", masked: true, reason: "" }]);
    expect(noReason.kind === "state" && noReason.state?.ok === false && noReason.state.error).toBe(
      "Change 1: reason — give a reason (at least 3 characters).",
    );
    const stray = await save(w.people.assay, [
      { runId: "00000000-0000-4000-8000-000000000000", well: "C1", masked: true, reason: "other run" },
    ]);
    expect(stray.kind === "state" && stray.state?.ok === false && stray.state.error).toBe(
      "Well C1 is on a run outside this experiment.",
    );
    expect(await openMasks()).toHaveLength(0);

    const ok = await save(w.people.assay, [{ runId, well: "C1", masked: true, reason: "outlier on the curve" }]);
    expect(ok.kind === "state" && ok.state?.ok).toBe(true);
    const after = await currentInputs(campaign, experiment);
    expect(after.hash).not.toBe(before.hash);
    expect(after.inputs.masks).toEqual([{ runId, well: "C1", reason: "outlier on the curve" }]);

    const second = await requestAnalysis(w.people.assay, campaign, experimentId);
    expect(second.reused).toBe(false);
    await runAnalysis(second.id);
    // INH-000001 had one well (C1): with it masked the compound has no data left.
    expect((await experimentResults(experimentId)).map((r) => r.compoundId)).not.toContain("INH-000001");

    const restore = await save(w.people.admin, [{ runId, well: "C1", masked: false, reason: "reading confirmed" }]);
    expect(restore.kind === "state" && restore.state?.ok).toBe(true);
    expect((await currentInputs(campaign, experiment)).hash).toBe(before.hash);
  });
});
