// The JSON API for changing experiments, overriding a mechanism call and planning a mechanism
// study, against the real database: happy path, bad input (a sentence, nothing written) and the
// wrong role. The single-dose world is the small INVENTED plate of src/test/plates.ts; the
// mechanism study uses the invented demo plates (src/lib/plates/demo-campaign.ts — invented
// data, not a reference). The planner's design is checked in src/lib/analysis/planner.test.ts.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { auditLog, experimentRuns, plateMaps } from "@/server/db/schema";
import { stopBoss } from "@/server/jobs/boss";
import { callRoute, makeWorld, type TestUser, type World } from "@/test/harness";
import { analysesWorld } from "@/test/analyses";
import { demoPlatesWorld, type PlatesWorld } from "@/test/analysis-plates";
import { analyseNow, compoundResultDetail, createExperiment, getExperiment } from ".";
import * as experimentRoute from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/route";
import * as overrideRoute from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/[registryId]/override/route";
import * as planRoute from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/[registryId]/plan/route";

let w: World;
let experimentId: string;
let runId: string;

beforeAll(async () => {
  w = await makeWorld();
  ({ experimentId, runId } = await analysesWorld(w));
}, 120_000);
afterAll(() => stopBoss());

const message = (j: unknown) => (j as { error: string }).error;

function patch(user: TestUser, body: unknown, world = w, id = experimentId) {
  return callRoute(experimentRoute.PATCH, {
    user,
    method: "PATCH",
    path: `/api/campaigns/${world.campaignId}/experiments/${id}`,
    params: { campaignId: world.campaignId, experimentId: id },
    body,
  });
}
function post(
  mod: { POST: unknown },
  tail: string,
  user: TestUser,
  registryId: string,
  body: unknown,
  world = w,
  id = experimentId,
) {
  return callRoute(mod.POST, {
    user,
    method: "POST",
    path: `/api/campaigns/${world.campaignId}/experiments/${id}/results/${registryId}/${tail}`,
    params: { campaignId: world.campaignId, experimentId: id, registryId },
    body,
  });
}

describe("PATCH …/experiments/{experimentId}", () => {
  it("replaces the settings (audited) and keeps the runs", async () => {
    const settings = { hitRule: { kind: "threshold", thresholdPct: 40 } };
    const r = await patch(w.people.lead, { settings });
    expect(r.status).toBe(200);
    expect(r.json).toMatchObject({ id: experimentId, runIds: [runId], settings });
    expect((await getExperiment(w.campaignId, experimentId)).settings).toEqual(settings);
    const audits = await db.select().from(auditLog).where(eq(auditLog.entityId, experimentId));
    expect(audits.map((a) => a.action)).toContain("experiment.update");
  });

  it("refuses bad settings, runs outside the campaign and an empty body (400) and writes nothing", async () => {
    const bad = await patch(w.people.assay, { settings: { weighting: "by-feel" } });
    expect(bad.status).toBe(400);
    const stranger = "00000000-0000-4000-8000-000000000000";
    const outside = await patch(w.people.assay, { runIds: [runId, stranger] });
    expect(outside.status).toBe(400);
    expect(message(outside.json)).toContain(stranger);
    expect((await patch(w.people.assay, {})).status).toBe(400);
    expect((await patch(w.people.assay, { runIds: [] })).status).toBe(400);
    const runs = await db.select().from(experimentRuns).where(eq(experimentRuns.experimentId, experimentId));
    expect(runs.map((r) => r.runId)).toEqual([runId]);
  });

  it("refuses a viewer and a chemist (403) and a non-member (404)", async () => {
    expect((await patch(w.people.viewer, { runIds: [runId] })).status).toBe(403);
    expect((await patch(w.people.chemist, { runIds: [runId] })).status).toBe(403);
    expect((await patch(w.people.nonMember, { runIds: [runId] })).status).toBe(404);
  });
});

describe("POST …/results/{registryId}/plan", () => {
  it("saves the planned matrix as a new plate map: 201 with its id and layout", async () => {
    const r = await post(planRoute, "plan", w.people.assay, "INH-000001", {
      name: "MoA plan INH-000001 (invented)",
      format: 384,
      ic50Um: 2,
      kmUm: 20,
    });
    expect(r.status).toBe(201);
    const out = r.json as { id: string; format: number; substrateUm: number[]; expectedKiUm: number; wells: unknown[] };
    expect(out.format).toBe(384);
    // Competitive Cheng–Prusoff at [S] = Km (the default): Ki = IC50 / 2 (common practice).
    expect(out.expectedKiUm).toBeCloseTo(1, 10);
    expect(out.substrateUm).toHaveLength(8);
    const [row] = await db.select().from(plateMaps).where(eq(plateMaps.id, out.id));
    expect(row).toMatchObject({ format: 384, campaignId: w.campaignId });
    expect(row!.wells.length).toBe(out.wells.length);
  });

  it("refuses a result with no IC50 to plan from, no Km, a bad format (400) and the wrong role (403)", async () => {
    const noIc50 = await post(planRoute, "plan", w.people.assay, "INH-000001", { name: "No IC50", kmUm: 20 });
    expect(noIc50.status).toBe(400);
    expect(message(noIc50.json)).toMatch(/ic50Um/);
    const noKm = await post(planRoute, "plan", w.people.assay, "INH-000001", { name: "No Km", ic50Um: 2 });
    expect(noKm.status).toBe(400);
    expect(message(noKm.json)).toMatch(/Km/);
    expect(
      (await post(planRoute, "plan", w.people.assay, "INH-000001", { name: "x", format: 500, ic50Um: 2 })).status,
    ).toBe(400);
    expect(
      (await post(planRoute, "plan", w.people.lead, "INH-000001", { name: "Lead plan", ic50Um: 2, kmUm: 20 })).status,
    ).toBe(403);
    expect(
      (await post(planRoute, "plan", w.people.chemist, "INH-000001", { name: "Chem plan", ic50Um: 2, kmUm: 20 }))
        .status,
    ).toBe(403);
    const maps = await db.select().from(plateMaps).where(eq(plateMaps.campaignId, w.campaignId));
    expect(maps.filter((m) => /plan/i.test(m.name)).map((m) => m.name)).toEqual(["MoA plan INH-000001 (invented)"]);
  });
});

describe("POST …/results/{registryId}/override", () => {
  let demo: PlatesWorld;
  let moa: string;
  beforeAll(async () => {
    demo = await demoPlatesWorld();
    const e = await createExperiment(demo.w.people.assay, demo.campaign, {
      name: "MoA (invented)",
      kind: "mechanism",
      runIds: [demo.runIds["mechanism-01"]!],
    });
    moa = e.id;
    await analyseNow(demo.w.people.assay, demo.campaign, moa);
  }, 240_000);

  it("records the override with its reason (audited) and the result stands for it", async () => {
    const r = await post(
      overrideRoute,
      "override",
      demo.w.people.lead,
      "INH-000001",
      { model: "mixed", reason: "Kiu within range (test)" },
      demo.w,
      moa,
    );
    expect(r.status).toBe(201);
    expect(r.json).toMatchObject({ registryId: "INH-000001", model: "mixed" });
    const detail = await compoundResultDetail(moa, "INH-000001");
    expect(detail.override).toMatchObject({ model: "mixed", reason: "Kiu within range (test)" });
    const audits = await db
      .select()
      .from(auditLog)
      .where(eq(auditLog.entityId, `${moa}/INH-000001`));
    expect(audits.map((a) => a.action)).toContain("mechanism.override");
  });

  it("refuses a bad model, a short reason, a single-dose experiment (400), no result (404) and the wrong role (403)", async () => {
    const bad = await post(
      overrideRoute,
      "override",
      demo.w.people.lead,
      "INH-000001",
      { model: "magic", reason: "because it is" },
      demo.w,
      moa,
    );
    expect(bad.status).toBe(400);
    expect(message(bad.json)).toMatch(/model/);
    expect(
      (
        await post(
          overrideRoute,
          "override",
          demo.w.people.lead,
          "INH-000001",
          { model: "mixed", reason: "ok" },
          demo.w,
          moa,
        )
      ).status,
    ).toBe(400);
    const single = await post(overrideRoute, "override", w.people.lead, "INH-000001", {
      model: "mixed",
      reason: "matrix reason here",
    });
    expect(single.status).toBe(400);
    expect(message(single.json)).toMatch(/Only mechanism studies/);
    expect(
      (
        await post(
          overrideRoute,
          "override",
          demo.w.people.lead,
          "INH-999999",
          { model: "mixed", reason: "no such result" },
          demo.w,
          moa,
        )
      ).status,
    ).toBe(404);
    expect(
      (
        await post(
          overrideRoute,
          "override",
          demo.w.people.viewer,
          "INH-000001",
          { model: "mixed", reason: "viewer tries" },
          demo.w,
          moa,
        )
      ).status,
    ).toBe(403);
    expect(
      (
        await post(
          overrideRoute,
          "override",
          demo.w.people.chemist,
          "INH-000001",
          { model: "mixed", reason: "chemist tries" },
          demo.w,
          moa,
        )
      ).status,
    ).toBe(403);
    const detail = await compoundResultDetail(moa, "INH-000001");
    expect(detail.override?.model).toBe("mixed");
  });
});
