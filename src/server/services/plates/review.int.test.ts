// QC review against the real Postgres: verdicts, masks (QC and % inhibition recomputed in the
// same transaction, audited, history kept) and accept/reject decisions.
// Outside reference: a worked example of the Z′ definition (Zhang, Chung & Oldenburg, J Biomol
// Screen 1999;4:67–73) on controls 1000 ± 31.6 and 100 ± 7.07, its figures calculated with SciPy.
// The plates are INVENTED data (fixtures/plates/README.md; test helpers in src/test/plates.ts).
import { describe, it, expect, beforeAll } from "vitest";
import { and, eq } from "drizzle-orm";
import { makeWorld, callRoute, type World } from "@/test/harness";
import { campaignRow, registryIds, smallExport, smallMap } from "@/test/plates";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { db } from "@/server/db/client";
import { auditLog, plateRuns, plateWellMasks, wellReadings } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import * as runRoute from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/route";
import { createPlateMap, decideRun, maskWell, unmaskWell, uploadRun } from ".";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
  await ensureCompoundsRegistered(registryIds(64));
});

describe("QC verdicts, masks and decisions", () => {
  it("a run whose controls are swapped fails QC and cannot be accepted", async () => {
    const { id: mapId } = await createPlateMap(w.people.assay, w.campaignId, {
      name: "Swapped controls",
      map: smallMap(true),
    });
    const run = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
      plateMapId: mapId,
      fileName: "swapped.csv",
      contentType: "text/csv",
      bytes: smallExport(5),
    });
    expect(run.qc.zPrime).toBeCloseTo(0.87102, 5); // Z′ alone cannot see it
    expect(run.qc.verdict).toBe("fail");
    const e = await decideRun(w.people.assay, w.campaignId, run.id, "accepted", "looks fine").catch((x: unknown) => x);
    expect((e as AppError).status).toBe(409);
    await decideRun(w.people.assay, w.campaignId, run.id, "rejected", "controls swapped at dispensing");
    const [row] = await db.select().from(plateRuns).where(eq(plateRuns.id, run.id));
    expect(row!.decision).toBe("rejected");
    const a = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, run.id), eq(auditLog.action, "plate_run.reject")));
    expect(a[0]!.reason).toBe("controls swapped at dispensing");
  });

  it("masking recomputes QC and % inhibition in one transaction, is audited, and unmasking keeps the history", async () => {
    const { id: mapId } = await createPlateMap(w.people.assay, w.campaignId, { name: "Mask test", map: smallMap() });
    const run = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
      plateMapId: mapId,
      fileName: "mask.csv",
      contentType: "text/csv",
      bytes: smallExport(9),
    });
    const qc = await maskWell(w.people.assay, w.campaignId, run.id, "A03", "pipetting error noted at set-up");
    // Without 1040 the neutral mean is (950+1010+980+1020+1000)/5 = 992.
    expect(qc.neutral!.mean).toBeCloseTo(992, 10);
    expect(qc.maskedWells).toBe(1);
    const [c1] = await db
      .select()
      .from(wellReadings)
      .where(and(eq(wellReadings.runId, run.id), eq(wellReadings.well, "C1")));
    expect(c1!.inhibitionPct).toBeCloseTo((100 * (992 - 550)) / (992 - 100), 10);
    const [a3] = await db
      .select()
      .from(wellReadings)
      .where(and(eq(wellReadings.runId, run.id), eq(wellReadings.well, "A3")));
    expect(a3!.masked).toBe(true);
    expect(
      ((await maskWell(w.people.assay, w.campaignId, run.id, "A3", "again").catch((x: unknown) => x)) as AppError)
        .status,
    ).toBe(409);
    await unmaskWell(w.people.assay, w.campaignId, run.id, "A3", "error was in another plate");
    const masks = await db.select().from(plateWellMasks).where(eq(plateWellMasks.runId, run.id));
    expect(masks).toHaveLength(1);
    expect(masks[0]!.unmaskedAt).not.toBeNull();
    expect(masks[0]!.unmaskReason).toBe("error was in another plate");
    const [again] = await db.select().from(plateRuns).where(eq(plateRuns.id, run.id));
    expect(again!.zPrime).toBeCloseTo(0.87102, 5);
    const acts = await db
      .select({ action: auditLog.action, reason: auditLog.reason })
      .from(auditLog)
      .where(eq(auditLog.entityId, run.id));
    expect(acts.map((x) => x.action).sort()).toEqual(["plate_run.mask", "plate_run.unmask", "plate_run.upload"]);
    await decideRun(w.people.assay, w.campaignId, run.id, "accepted", "QC passes; controls look normal");
    const [decided] = await db.select().from(plateRuns).where(eq(plateRuns.id, run.id));
    expect(decided!.decision).toBe("accepted");
  });

  it("a mask without a reason is refused", async () => {
    const [run] = await db
      .select({ id: plateRuns.id })
      .from(plateRuns)
      .where(eq(plateRuns.campaignId, w.campaignId))
      .limit(1);
    const e = (await maskWell(w.people.assay, w.campaignId, run!.id, "A1", " ").catch((x: unknown) => x)) as AppError;
    expect(e.status).toBe(400);
    expect(e.message).toBe("Give a reason for masking a well (at least 3 characters).");
  });

  it("another campaign's run answers 404", async () => {
    const [run] = await db
      .select({ id: plateRuns.id })
      .from(plateRuns)
      .where(eq(plateRuns.campaignId, w.campaignId))
      .limit(1);
    const r = await callRoute(runRoute.GET, {
      user: w.people.nonMember,
      path: "/x",
      params: { campaignId: w.otherCampaignId, runId: run!.id },
    });
    expect(r.status).toBe(404);
  });
});
