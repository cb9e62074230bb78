// The JSON API for reviewing plate runs and keeping plate maps, against the real database: each
// route's happy path, its refusals of bad input (a sentence, nothing written) and of the wrong
// role. Plates are the small INVENTED 96-well plate of src/test/plates.ts (controls from a
// small worked example: Z′ 0.871 by the definition of Zhang, Chung & Oldenburg, J Biomol Screen 1999).
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { and, eq, isNull } from "drizzle-orm";
import { db } from "@/server/db/client";
import { auditLog, plateMaps, plateRuns, plateWellMasks } from "@/server/db/schema";
import { stopBoss } from "@/server/jobs/boss";
import { callRoute, makeWorld, type World } from "@/test/harness";
import { campaignRow, platesWorld, smallExport, smallMap } from "@/test/plates";
import { createPlateMap, uploadRun } from ".";
import * as decisionRoute from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/decision/route";
import * as masksRoute from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/masks/route";
import * as maskRoute from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/masks/[well]/route";
import * as mapRoute from "@/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/route";
import * as copyRoute from "@/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/copy/route";

let w: World;
let mapId: string;
let runId: string;

beforeAll(async () => {
  w = await makeWorld();
  ({ mapId, runId } = await platesWorld(w));
}, 120_000);
afterAll(() => stopBoss());

const runPath = (id: string, tail: string) => `/api/campaigns/${w.campaignId}/plate-runs/${id}/${tail}`;
const mapPath = (id: string, tail = "") => `/api/campaigns/${w.campaignId}/plate-maps/${id}${tail}`;
const message = (j: unknown) => (j as { error: string }).error;

async function openMasks(run: string) {
  return db
    .select({ well: plateWellMasks.well })
    .from(plateWellMasks)
    .where(and(eq(plateWellMasks.runId, run), isNull(plateWellMasks.unmaskedAt)));
}

describe("POST …/plate-runs/{runId}/decision", () => {
  const decide = (user: World["people"]["assay"], id: string, body: unknown) =>
    callRoute(decisionRoute.POST, {
      user,
      method: "POST",
      path: runPath(id, "decision"),
      params: { campaignId: w.campaignId, runId: id },
      body,
    });

  it("accepts a passing run without a reason (one is recorded) and audits it", async () => {
    const r = await decide(w.people.assay, runId, { decision: "accept" });
    expect(r.status).toBe(200);
    expect(r.json).toMatchObject({ runId, decision: "accepted", verdict: "pass" });
    const [run] = await db.select().from(plateRuns).where(eq(plateRuns.id, runId));
    expect(run!.decision).toBe("accepted");
    expect(run!.decisionReason).toMatch(/QC passes/);
    const rows = await db.select().from(auditLog).where(eq(auditLog.entityId, runId));
    expect(rows.some((a) => a.action === "plate_run.accept")).toBe(true);
  });

  it("refuses a rejection without a reason and a bad decision (400), and a viewer or chemist (403)", async () => {
    const noReason = await decide(w.people.assay, runId, { decision: "reject" });
    expect(noReason.status).toBe(400);
    expect(JSON.stringify(noReason.json)).toMatch(/reason/);
    expect((await decide(w.people.assay, runId, { decision: "maybe", reason: "why not" })).status).toBe(400);
    expect((await decide(w.people.viewer, runId, { decision: "reject", reason: "not mine" })).status).toBe(403);
    expect((await decide(w.people.chemist, runId, { decision: "reject", reason: "not mine" })).status).toBe(403);
    expect((await decide(w.people.nonMember, runId, { decision: "reject", reason: "not mine" })).status).toBe(404);
    const [run] = await db.select().from(plateRuns).where(eq(plateRuns.id, runId));
    expect(run!.decision).toBe("accepted");
  });

  it("refuses to accept a run that fails QC (409 with the reason), as the page does; rejecting it works", async () => {
    // The same plate with the control roles swapped: signal rises where it should fall, so QC fails.
    const { id: swapped } = await createPlateMap(w.people.assay, w.campaignId, {
      name: "Swapped controls (invented)",
      map: smallMap(true),
    });
    const bad = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
      plateMapId: swapped,
      fileName: "swapped.csv",
      contentType: "text/csv",
      bytes: smallExport(80_077), // a salt of its own: another test checks that smallExport(77) is never stored
    });
    expect(bad.qc.verdict).toBe("fail");
    const r = await decide(w.people.assay, bad.id, { decision: "accept", reason: "looks fine to me" });
    expect(r.status).toBe(409);
    expect(message(r.json)).toMatch(/fails QC/);
    const ok = await decide(w.people.assay, bad.id, { decision: "reject", reason: "controls swapped" });
    expect(ok.status).toBe(200);
    expect(ok.json).toMatchObject({ decision: "rejected", reason: "controls swapped", verdict: "fail" });
  });
});

describe("POST …/masks and DELETE …/masks/{well}", () => {
  const mask = (user: World["people"]["assay"], body: unknown) =>
    callRoute(masksRoute.POST, {
      user,
      method: "POST",
      path: runPath(runId, "masks"),
      params: { campaignId: w.campaignId, runId },
      body,
    });
  const unmask = (user: World["people"]["assay"], well: string, body: unknown) =>
    callRoute(maskRoute.DELETE, {
      user,
      method: "DELETE",
      path: runPath(runId, `masks/${well}`),
      params: { campaignId: w.campaignId, runId, well },
      body,
    });

  it("refuses names that are not wells of the run's 96-well plate, naming them, and writes nothing", async () => {
    const r = await mask(w.people.assay, { wells: ["C3", "Q30", "A13"], reason: "bubble" });
    expect(r.status).toBe(400);
    expect(message(r.json)).toContain("Q30");
    expect(message(r.json)).toContain("A13");
    expect(await openMasks(runId)).toEqual([]);
    expect((await mask(w.people.assay, { wells: [], reason: "bubble" })).status).toBe(400);
    expect((await mask(w.people.assay, { wells: ["C3"] })).status).toBe(400);
  });

  it("masks wells with one reason (all or nothing, audited), refuses a second mask (409) and the wrong role", async () => {
    expect((await mask(w.people.viewer, { wells: ["C3"], reason: "bubble seen" })).status).toBe(403);
    const r = await mask(w.people.assay, { wells: ["c3", "C4"], reason: "bubble seen" });
    expect(r.status).toBe(200);
    expect(r.json).toMatchObject({ runId, wells: ["C3", "C4"], masked: true, qc: { verdict: "pass" } });
    expect((await openMasks(runId)).map((m) => m.well).sort()).toEqual(["C3", "C4"]);
    const again = await mask(w.people.assay, { wells: ["C5", "C3"], reason: "bubble seen" });
    expect(again.status).toBe(409);
    expect((await openMasks(runId)).map((m) => m.well).sort()).toEqual(["C3", "C4"]);
    const audits = await db.select().from(auditLog).where(eq(auditLog.entityId, runId));
    expect(audits.filter((a) => a.action === "plate_run.mask")).toHaveLength(2);
  });

  it("unmasks one well with a reason; 409 when it is not masked, 400 for a bad name or no reason, 403 for a chemist", async () => {
    expect((await unmask(w.people.chemist, "C3", { reason: "fine after review" })).status).toBe(403);
    expect((await unmask(w.people.assay, "C3", {})).status).toBe(400);
    expect((await unmask(w.people.assay, "Z99", { reason: "fine after review" })).status).toBe(400);
    const r = await unmask(w.people.assay, "C3", { reason: "fine after review" });
    expect(r.status).toBe(200);
    expect(r.json).toMatchObject({ wells: ["C3"], masked: false });
    expect((await openMasks(runId)).map((m) => m.well)).toEqual(["C4"]);
    expect((await unmask(w.people.assay, "C3", { reason: "fine after review" })).status).toBe(409);
  });
});

describe("plate maps: GET, PATCH, DELETE, copy", () => {
  const get = (user: World["people"]["assay"], id: string) =>
    callRoute(mapRoute.GET, { user, path: mapPath(id), params: { campaignId: w.campaignId, plateMapId: id } });
  const patch = (user: World["people"]["assay"], id: string, body: unknown) =>
    callRoute(mapRoute.PATCH, {
      user,
      method: "PATCH",
      path: mapPath(id),
      params: { campaignId: w.campaignId, plateMapId: id },
      body,
    });
  const del = (user: World["people"]["assay"], id: string) =>
    callRoute(mapRoute.DELETE, {
      user,
      method: "DELETE",
      path: mapPath(id),
      params: { campaignId: w.campaignId, plateMapId: id },
    });
  const copy = (user: World["people"]["assay"], id: string, body: unknown) =>
    callRoute(copyRoute.POST, {
      user,
      method: "POST",
      path: mapPath(id, "/copy"),
      params: { campaignId: w.campaignId, plateMapId: id },
      body,
    });

  it("reads one map with its layout and use to members; 404 to a non-member", async () => {
    const r = await get(w.people.viewer, mapId);
    expect(r.status).toBe(200);
    const m = r.json as { format: number; runs: number; sampleWells: number; wells: { well: string; role: string }[] };
    expect(m.format).toBe(96);
    expect(m.runs).toBeGreaterThanOrEqual(1);
    expect(m.sampleWells).toBe(12);
    expect(m.wells.filter((x) => x.role === "neutral")).toHaveLength(6);
    expect((await get(w.people.nonMember, mapId)).status).toBe(404);
  });

  it("changes an unused map (name, wells), refuses bad wells (400) and a used map (409)", async () => {
    const { id } = await createPlateMap(w.people.assay, w.campaignId, { name: "Draft (invented)", map: smallMap() });
    expect((await patch(w.people.viewer, id, { name: "x" })).status).toBe(403);
    const bad = await patch(w.people.assay, id, { wells: [{ well: "M40", role: "sample", compound: "INH-000001" }] });
    expect(bad.status).toBe(400);
    expect(message(bad.json)).toMatch(/M40/);
    const [before] = await db.select().from(plateMaps).where(eq(plateMaps.id, id));
    expect(before!.name).toBe("Draft (invented)");
    const wells = smallMap().wells.filter((x) => x.role !== "empty" && x.well !== "C12");
    const ok = await patch(w.people.assay, id, { name: "Draft 2 (invented)", template: true, wells });
    expect(ok.status).toBe(200);
    expect(ok.json).toMatchObject({ name: "Draft 2 (invented)", isTemplate: true, sampleWells: 11 });
    const used = await patch(w.people.assay, mapId, { name: "Renamed" });
    expect(used.status).toBe(409);
    expect(message(used.json)).toMatch(/Save your changes as a new plate map/);
  });

  it("copies a map as a template (201), refuses a taken name (409) and a chemist (403)", async () => {
    const r = await copy(w.people.assay, mapId, { name: "Copy of the matrix map (invented)" });
    expect(r.status).toBe(201);
    const id = (r.json as { id: string }).id;
    const [row] = await db.select().from(plateMaps).where(eq(plateMaps.id, id));
    expect(row).toMatchObject({ isTemplate: true, format: 96, sampleWells: 12, neutralWells: 6, fullWells: 6 });
    expect((await copy(w.people.assay, mapId, { name: "Copy of the matrix map (invented)" })).status).toBe(409);
    expect((await copy(w.people.assay, mapId, { name: "" })).status).toBe(400);
    expect((await copy(w.people.chemist, mapId, { name: "Chemist copy" })).status).toBe(403);
  });

  it("deletes an unused map (204, audited) and keeps a used one with a sentence (409)", async () => {
    const { id } = await createPlateMap(w.people.assay, w.campaignId, {
      name: "To delete (invented)",
      map: smallMap(),
    });
    expect((await del(w.people.viewer, id)).status).toBe(403);
    expect((await del(w.people.assay, id)).status).toBe(204);
    expect((await get(w.people.assay, id)).status).toBe(404);
    const audits = await db.select().from(auditLog).where(eq(auditLog.entityId, id));
    expect(audits.map((a) => a.action)).toContain("plate_map.delete");
    const used = await del(w.people.assay, mapId);
    expect(used.status).toBe(409);
    expect(message(used.json)).toMatch(/uploaded against plate map/);
    expect(await db.select().from(plateMaps).where(eq(plateMaps.id, mapId))).toHaveLength(1);
  });
});
