// A mechanism analysis of the invented demo plate (src/lib/plates/demo-campaign.ts — invented data,
// not a reference) records the engine version that produced it, in the analysis row and in the
// inputs its hash is taken over, so results from before a change of the engine are told apart and
// re-requesting after an upgrade computes afresh.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { ENGINE_VERSION } from "@/lib/kinetics";
import { SPECIAL_COMPOUNDS } from "@/lib/plates/demo-campaign";
import { stopBoss } from "@/server/jobs/boss";
import { demoPlatesWorld, type PlatesWorld } from "@/test/analysis-plates";
import { analysisJson, createExperiment, experimentResults, getAnalysis, requestAnalysis, runAnalysis } from ".";

let world: PlatesWorld;
beforeAll(async () => {
  world = await demoPlatesWorld();
}, 240_000);
afterAll(() => stopBoss());

describe("engine version in the provenance", () => {
  it("the analysis and its hashed inputs carry ENGINE_VERSION; the demo's mechanism calls carry no false tight-binding flag", async () => {
    const { w, campaign, runIds } = world;
    const e = await createExperiment(w.people.assay, campaign, {
      name: "MoA version",
      kind: "mechanism",
      runIds: [runIds["mechanism-01"]!],
    });
    const a = await requestAnalysis(w.people.assay, campaign, e.id);
    await runAnalysis(a.id);
    const stored = await getAnalysis(w.campaignId, a.id);
    expect(stored.engineVersion).toBe(ENGINE_VERSION);
    expect(stored.inputs.engineVersion).toBe(ENGINE_VERSION);
    expect(analysisJson(stored).engineVersion).toBe(ENGINE_VERSION);
    // The demo's [E] is 10 nM and every Ki is ≥ 0.8 µM (80-fold or more): depletion cannot matter.
    const rows = await experimentResults(e.id);
    for (const c of SPECIAL_COMPOUNDS.slice(0, 4)) {
      const r = rows.find((x) => x.compoundId === c.id)!;
      expect(r.flags, c.id).not.toContain("tight-binding");
      expect((r.detail as { recommended?: string }).recommended ?? "", c.id).not.toMatch(/^tight-binding/);
    }
  });
});
