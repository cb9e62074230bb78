// Reading results back against the real database: the model a mechanism result stands for
// after an override, the masked wells the dose-response plot draws, the provenance history and
// the campaign boundary of an analysis. Plates are the invented demo plates
// (src/lib/plates/demo-campaign.ts — invented data, not a reference).
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { stopBoss } from "@/server/jobs/boss";
import { maskWell } from "@/server/services/plates";
import { demoPlatesWorld, doseResponseRuns, type PlatesWorld } from "@/test/analysis-plates";
import {
  analyseNow,
  analysisHistory,
  chosenModel,
  compoundResultDetail,
  createExperiment,
  getAnalysis,
  maskedPoints,
  overrideMechanism,
  resultJson,
} from ".";

let world: PlatesWorld;

beforeAll(async () => {
  world = await demoPlatesWorld();
}, 240_000);
afterAll(() => stopBoss());

describe("results of an analysis (invented plates)", () => {
  it("a mechanism override changes the model the result stands for, and the API shows it", async () => {
    const { w, campaign, runIds } = world;
    const e = await createExperiment(w.people.assay, campaign, {
      name: "MoA",
      kind: "mechanism",
      runIds: [runIds["mechanism-01"]!],
    });
    await analyseNow(w.people.assay, campaign, e.id);
    const fitted = await compoundResultDetail(e.id, "INH-000001");
    expect(chosenModel(fitted)).toBe("competitive");
    await overrideMechanism(w.people.lead, w.campaignId, e.id, "INH-000001", "mixed", "Kiu within range (test)");
    const r = await compoundResultDetail(e.id, "INH-000001");
    expect(r.mechanism).toBe("competitive");
    expect(chosenModel(r)).toBe("mixed");
    const json = resultJson(r) as { mechanism: { override: { model: string; reason: string } | null } };
    expect(json.mechanism.override).toMatchObject({ model: "mixed", reason: "Kiu within range (test)" });
    await expect(compoundResultDetail(e.id, "INH-999999")).rejects.toThrow("No result for this compound");
  });

  it("lists a compound's masked wells, and keeps the provenance history newest first", async () => {
    const { w, campaign, runIds } = world;
    const e = await createExperiment(w.people.lead, campaign, {
      name: "DR",
      kind: "dose-response",
      runIds: doseResponseRuns(runIds),
      settings: { substrateUm: 20 },
    });
    const first = await analyseNow(w.people.lead, campaign, e.id);
    const r1 = await compoundResultDetail(e.id, "INH-000003");
    if (r1.kind !== "dose-response") throw new Error("expected a dose-response result");
    const [conc, pct, runId, well] = r1.detail.points[0]!;
    await maskWell(w.people.assay, w.campaignId, runId, well, "bubble in well (test)");
    const second = await analyseNow(w.people.lead, campaign, e.id);

    const analysis = await getAnalysis(w.campaignId, second.id);
    const masked = await maskedPoints(analysis.inputs, "INH-000003");
    expect(masked).toHaveLength(1);
    expect(masked[0]![0]).toBe(conc);
    expect(masked[0]![1]).toBeCloseTo(pct, 6);
    expect(await maskedPoints(analysis.inputs, "INH-000001")).toEqual([]);

    const history = await analysisHistory(e.id);
    expect(history.map((a) => a.id)).toEqual([second.id, first.id]);
    expect(history.map((a) => a.isCurrent)).toEqual([true, false]);
    expect(history[0]!.inputs.masks).toContainEqual({ runId, well, reason: "bubble in well (test)" });
  });

  it("an analysis is not found from another campaign", async () => {
    const { w, campaign, runIds } = world;
    const e = await createExperiment(w.people.assay, campaign, {
      name: "Screen",
      kind: "single-dose",
      runIds: doseResponseRuns(runIds),
    });
    const a = await analyseNow(w.people.assay, campaign, e.id);
    expect((await getAnalysis(w.campaignId, a.id)).experimentId).toBe(e.id);
    await expect(getAnalysis(w.otherCampaignId, a.id)).rejects.toThrow("No such analysis.");
    await expect(getAnalysis(w.campaignId, "not-a-uuid")).rejects.toThrow("No such analysis.");
  });
});
