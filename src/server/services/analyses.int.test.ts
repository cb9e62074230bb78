// The analysis pipeline end to end against the real database and S3 fake: invented plates
// written by the simulator from known parameters (src/lib/plates/demo-campaign.ts — invented
// data, not a reference) go through upload, QC and analysis, and the known parameters come
// back. Within 15 % is the issue's acceptance bar (common practice for a replicated assay).
import { describe, it, expect, beforeAll } from "vitest";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses, campaigns, compoundResults } from "@/server/db/schema";
import { makeWorld, type World } from "@/test/harness";
import { demoCampaignPlates, SPECIAL_COMPOUNDS } from "@/lib/plates/demo-campaign";
import { parsePlateMapCsv } from "@/lib/plates";
import { createPlateMap, uploadRun, decideRun, maskWell } from "./plates";
import { createExperiment, requestAnalysis, runAnalysis, experimentResults, resultJson } from "./analyses";
import { ensureCompoundsRegistered } from "@/test/compounds";

const demo = demoCampaignPlates(20240601, { screenPlates: 0, compoundCount: 40 });
const within = (got: number | null | undefined, want: number, tol = 0.15) => {
  expect(got).not.toBeNull();
  expect(Math.abs(got! / want - 1)).toBeLessThanOrEqual(tol);
};

let w: World;
let campaign: typeof campaigns.$inferSelect;
const runIds: Record<string, string> = {};

beforeAll(async () => {
  w = await makeWorld();
  // The invented demo assay: Km 20 µM, enzyme 10 nM.
  [campaign] = (await db
    .update(campaigns)
    .set({ kmValue: 20, kmUnit: "µM", enzymeConcValue: 10, enzymeConcUnit: "nM" })
    .where(eq(campaigns.id, w.campaignId))
    .returning()) as [typeof campaigns.$inferSelect];
  await ensureCompoundsRegistered(demo.compounds.map((c) => c.id));
  for (const p of demo.plates) {
    const parsed = parsePlateMapCsv(p.mapCsv, p.format, `${p.name}.map.csv`);
    if (!parsed.ok) throw new Error(parsed.issues[0]!.text);
    const map = await createPlateMap(w.people.assay, w.campaignId, { name: p.name, map: parsed.map });
    const run = await uploadRun(w.people.assay, campaign, {
      plateMapId: map.id,
      fileName: p.file.name,
      contentType: "text/csv",
      bytes: new TextEncoder().encode(p.file.contents),
    });
    expect(run.qc.verdict, `${p.name}: ${JSON.stringify(run.qc)}`).toBe("pass");
    await decideRun(w.people.assay, w.campaignId, run.id, "accepted", "QC passes");
    runIds[p.name] = run.id;
  }
}, 240_000);

describe("mechanism study (invented plate from known constants)", () => {
  it("recovers each mechanism and its Ki within 15 %", async () => {
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
    const ids = Object.entries(runIds)
      .filter(([n]) => n.startsWith("dose-response"))
      .map(([, id]) => id);
    const e = await createExperiment(w.people.lead, campaign, {
      name: "DR",
      kind: "dose-response",
      runIds: ids,
      settings: { substrateUm: 20 },
    });
    experimentId = e.id;
    const a = await requestAnalysis(w.people.lead, campaign, e.id);
    await runAnalysis(a.id);
  });

  it("recovers the IC50 of the mechanism compounds at S = Km (Cheng–Prusoff worked values, science.md)", async () => {
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

  it("is idempotent: the same inputs give the same analysis and no new rows", async () => {
    const before = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(compoundResults)
      .where(eq(compoundResults.experimentId, experimentId));
    const again = await requestAnalysis(w.people.lead, campaign, experimentId);
    expect(again.reused).toBe(true);
    await runAnalysis(again.id);
    const after = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(compoundResults)
      .where(eq(compoundResults.experimentId, experimentId));
    expect(after[0]!.n).toBe(before[0]!.n);
  });

  it("a mask changes the result and is recorded; an analysis killed part-way keeps the previous results", async () => {
    const first = await experimentResults(experimentId);
    const r1 = first.find((x) => x.compoundId === "INH-000003")!;
    const pts = (r1.detail as { points: [number, number, string, string][] }).points;
    const [, , runId, well] = pts.find((p) => p[0] === Math.max(...pts.map((q) => q[0])))!;
    await maskWell(w.people.assay, w.campaignId, runId, well, "bubble in well (test)");
    const a2 = await requestAnalysis(w.people.assay, campaign, experimentId);
    expect(a2.reused).toBe(false);
    await runAnalysis(a2.id);
    const second = await experimentResults(experimentId);
    const r2 = second.find((x) => x.compoundId === "INH-000003")!;
    expect(r2.nPoints).toBe(r1.nPoints - 1);
    expect(r2.ic50Um).not.toBe(r1.ic50Um);
    const [row] = await db.select().from(analyses).where(eq(analyses.id, a2.id));
    expect(row!.inputs.masks).toContainEqual({ runId, well, reason: "bubble in well (test)" });

    // Another mask, then an analysis that dies after computing but before committing.
    const other = pts.find((p) => p[3] !== well)!;
    await maskWell(w.people.assay, w.campaignId, other[2], other[3], "second mask (test)");
    const a3 = await requestAnalysis(w.people.assay, campaign, experimentId);
    await expect(
      runAnalysis(a3.id, (f) => {
        if (f >= 0.8) throw new Error("worker killed (test)");
      }),
    ).rejects.toThrow("worker killed");
    const third = await experimentResults(experimentId);
    expect(third.find((x) => x.compoundId === "INH-000003")!.ic50Um).toBe(r2.ic50Um);
    const [failed] = await db.select().from(analyses).where(eq(analyses.id, a3.id));
    expect(failed!.status).toBe("failed");
    const current = await db
      .select()
      .from(analyses)
      .where(and(eq(analyses.experimentId, experimentId), eq(analyses.isCurrent, true)));
    expect(current.map((c) => c.id)).toEqual([a2.id]);
  });
});
