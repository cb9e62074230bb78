// The analysis pipeline end to end against the real database and S3 fake: invented plates
// written by the simulator from known parameters (src/lib/plates/demo-campaign.ts — invented
// data, not a reference) go through upload, QC and analysis, and the known parameters come
// back. Within 15 % is the acceptance bar (common practice for a replicated assay).
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { SPECIAL_COMPOUNDS } from "@/lib/plates/demo-campaign";
import { stopBoss } from "@/server/jobs/boss";
import { demoPlatesWorld, doseResponseRuns, within, type PlatesWorld } from "@/test/analysis-plates";
import { createExperiment, requestAnalysis, runAnalysis, experimentResults, resultJson } from ".";

let world: PlatesWorld;

beforeAll(async () => {
  world = await demoPlatesWorld();
}, 240_000);
afterAll(() => stopBoss());

describe("mechanism study (invented plate from known constants)", () => {
  it("recovers each mechanism and its Ki within 15 %", async () => {
    const { w, campaign, runIds } = world;
    const e = await createExperiment(w.people.assay, campaign, {
      name: "MoA",
      kind: "mechanism",
      runIds: [runIds["mechanism-01"]!],
    });
    const a = await requestAnalysis(w.people.assay, campaign, e.id);
    await runAnalysis(a.id);
    const rows = await experimentResults(e.id);
    const by = new Map(rows.map((r) => [r.compoundId, r]));
    for (const truth of SPECIAL_COMPOUNDS.slice(0, 4)) {
      if (truth.kind !== "mechanism") continue;
      const r = by.get(truth.id)!;
      expect(r.mechanism, truth.id).toBe(truth.model);
      if (truth.model === "competitive") within(r.kicUm, truth.kicUm!);
      if (truth.model === "uncompetitive") within(r.kiuUm, truth.kiuUm!);
      if (truth.model === "noncompetitive") within(r.kiUm, truth.kicUm!);
      if (truth.model === "mixed") {
        within(r.kicUm, truth.kicUm!);
        within(r.kiuUm, truth.kiuUm!);
      }
      const json = resultJson(r) as { mechanism: { ki: number; kiCi95: number[]; models: object } };
      expect(Object.keys(json.mechanism.models).sort()).toEqual([
        "competitive",
        "mixed",
        "noncompetitive",
        "uncompetitive",
      ]);
    }
  });
});

describe("dose-response (invented plates)", () => {
  let experimentId: string;
  beforeAll(async () => {
    const { w, campaign, runIds } = world;
    const e = await createExperiment(w.people.lead, campaign, {
      name: "DR",
      kind: "dose-response",
      runIds: doseResponseRuns(runIds),
      settings: { substrateUm: 20 },
    });
    experimentId = e.id;
    const a = await requestAnalysis(w.people.lead, campaign, e.id);
    await runAnalysis(a.id);
  });

  it("recovers the IC50 of the mechanism compounds at S = Km (Cheng–Prusoff worked values, Cheng & Prusoff 1973)", async () => {
    const rows = await experimentResults(experimentId);
    const by = new Map(rows.map((r) => [r.compoundId, r]));
    // IC50 at S = Km = 20 µM: competitive 2·Kic, uncompetitive 2·Kiu, noncompetitive Ki, mixed Kic 1, Kiu 4 → 1.6.
    within(by.get("INH-000001")!.ic50Um, 1.6);
    within(by.get("INH-000002")!.ic50Um, 3.0);
    within(by.get("INH-000003")!.ic50Um, 2.0);
    within(by.get("INH-000004")!.ic50Um, 1.6);
    for (const id of ["INH-000001", "INH-000002", "INH-000003", "INH-000004"]) within(by.get(id)!.hill, 1, 0.25);
  });

  it("flags the tight binder and recovers K′ with the Morrison equation (K′ 1 nM at E 10 nM → IC50 6 nM)", async () => {
    const r = (await experimentResults(experimentId)).find((x) => x.compoundId === "INH-000005")!;
    expect(r.flags).toContain("tight-binding-suspected");
    const m = (r.detail as { morrison: { kAppUm: number; ic50Um: number } }).morrison;
    within(m.kAppUm, 0.001, 0.5);
    within(m.ic50Um, 0.006, 0.15);
  });

  it("flags the partial inhibitor (35 % activity left)", async () => {
    const r = (await experimentResults(experimentId)).find((x) => x.compoundId === "INH-000006")!;
    expect(r.flags).toContain("partial-inhibition");
    within((r.detail as { fit: { topPct: number } }).fit.topPct, 65, 0.1);
  });
});
