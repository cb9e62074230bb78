// Requesting analyses against the real database: the same inputs give the same analysis back, a
// mask changes the inputs, a computation killed part-way keeps the previous results, and a queued
// analysis always has its background job. Plates are the invented demo plates
// (src/lib/plates/demo-campaign.ts — invented data, not a reference).
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses, compoundResults } from "@/server/db/schema";
import { boss, QUEUES, stopBoss } from "@/server/jobs/boss";
import { maskWell } from "@/server/services/plates";
import { demoPlatesWorld, doseResponseRuns, type PlatesWorld } from "@/test/analysis-plates";
import { analyseNow, createExperiment, requestAnalysis, runAnalysis, experimentResults } from ".";

let world: PlatesWorld;
let experimentId: string;

beforeAll(async () => {
  world = await demoPlatesWorld();
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
}, 240_000);
afterAll(() => stopBoss());

const jobOf = async (analysisId: string) => (await boss()).getJobById(QUEUES.analysis, analysisId);

describe("requesting an analysis (invented plates)", () => {
  it("is idempotent: the same inputs give the same analysis and no new rows", async () => {
    const { w, campaign } = world;
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
    const { w, campaign } = world;
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

  it("queues the background job itself, under the analysis id, after the row commits", async () => {
    const { w, campaign } = world;
    const [run] = doseResponseRuns(world.runIds);
    const e = await createExperiment(w.people.lead, campaign, {
      name: "DR one plate",
      kind: "dose-response",
      runIds: [run!],
    });
    const a = await requestAnalysis(w.people.lead, campaign, e.id);
    expect(a).toMatchObject({ status: "queued", reused: false });
    const job = await jobOf(a.id);
    expect(job?.data).toEqual({ analysisId: a.id });
    expect(job?.state).toBe("created");
    // Asked again while queued: the same analysis, still one job.
    const again = await requestAnalysis(w.people.lead, campaign, e.id);
    expect(again).toMatchObject({ id: a.id, status: "queued", reused: true });
    expect((await jobOf(a.id))?.id).toBe(a.id);
  });

  it("analyseNow computes in this process without a job (the seed's path)", async () => {
    const { w, campaign } = world;
    const [run] = doseResponseRuns(world.runIds);
    const e = await createExperiment(w.people.lead, campaign, {
      name: "DR inline",
      kind: "dose-response",
      runIds: [run!],
      settings: { substrateUm: 20 },
    });
    const a = await analyseNow(w.people.lead, campaign, e.id);
    expect(a).toMatchObject({ status: "done", reused: false });
    const [row] = await db.select().from(analyses).where(eq(analyses.id, a.id));
    expect(row).toMatchObject({ status: "done", isCurrent: true });
    expect((await experimentResults(e.id)).length).toBe(row!.compounds);
    expect(await jobOf(a.id)).toBeNull();
  });
});
