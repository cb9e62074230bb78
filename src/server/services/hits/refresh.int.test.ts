// Hit rows against the real database: written with the analysis results, pKi / LE / LipE as the
// published definitions give them (src/lib/hits/efficiency.ts), and the headline Ki of an
// overriding model as src/lib/analysis/headline-ki.ts chooses it. The results are INVENTED
// (src/test/hits.ts), not reference data.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { and, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { compounds, hitRows, mechanismOverrides } from "@/server/db/schema";
import { makeWorld, type World } from "@/test/harness";
import { analysesWorld } from "@/test/analyses";
import { addAnalysis, hitIds, hitsWorld } from "@/test/hits";
import { ligandEfficiency, lipophilicEfficiency, pKiFromMicromolar } from "@/lib/hits/efficiency";
import { headlineKi } from "@/lib/analysis/headline-ki";
import type { ModelSummary } from "@/lib/analysis/detail";
import { INHIBITION_MODELS, type InhibitionModel } from "@/lib/kinetics";
import { stopBoss } from "@/server/jobs/boss";
import { refreshHitRows } from ".";

let w: World;
let runId: string;

beforeAll(async () => {
  ({ w, runId } = await hitsWorld());
});
afterAll(() => stopBoss());

const rowOf = async (id: string) =>
  (
    await db
      .select()
      .from(hitRows)
      .where(and(eq(hitRows.campaignId, w.campaignId), eq(hitRows.compoundId, id)))
  )[0]!;

describe("hit rows", () => {
  it("are written by runAnalysis in its results transaction", async () => {
    const w2 = await makeWorld();
    await analysesWorld(w2);
    const rows = await db.select().from(hitRows).where(eq(hitRows.campaignId, w2.campaignId));
    expect(rows.map((r) => r.compoundId).sort()).toEqual(hitIds);
    // The small test plate (src/test/plates.ts): C1 reads 550 between controls at 1000 and 100 → 50 % (worked by hand: 100·(1000 − 550)/(1000 − 100) = 50).
    expect(rows.find((r) => r.compoundId === "INH-000001")!.pctInhibition).toBeCloseTo(50, 6);
    expect(rows.every((r) => r.lastTestedAt !== null)).toBe(true);
  });

  it("hold pKi, LE and LipE computed from the published definitions (same as src/lib/hits/efficiency.ts)", async () => {
    const [r] = await db
      .select()
      .from(hitRows)
      .where(and(eq(hitRows.campaignId, w.campaignId), eq(hitRows.compoundId, "INH-000002")));
    const [c] = await db.select().from(compounds).where(eq(compounds.registryId, "INH-000002"));
    // Ki 10 nM → pKi 8 (definition); LE = 1.37·pKi/HA (Hopkins, Groom & Alex 2004); LipE = pKi − cLogP (Leeson & Springthorpe 2007).
    expect(r!.pKi).toBeCloseTo(8, 10);
    expect(r!.le).toBeCloseTo((1.37 * 8) / c!.heavyAtoms, 10);
    expect(r!.le).toBeCloseTo(ligandEfficiency(pKiFromMicromolar(0.01), c!.heavyAtoms)!, 10);
    expect(r!.lipe).toBeCloseTo(lipophilicEfficiency(8, c!.clogp)!, 10);
    expect(r!.mwGPerMol).toBe(c!.mwGPerMol);
    const none = await db
      .select()
      .from(hitRows)
      .where(and(eq(hitRows.campaignId, w.campaignId), eq(hitRows.compoundId, "INH-000001")));
    expect(none[0]!.le).toBeNull();
  });

  it("store pKi, LE and LipE equal to the TypeScript definitions for every row", async () => {
    const rows = await db.select().from(hitRows).where(eq(hitRows.campaignId, w.campaignId));
    const cs = await db.select().from(compounds);
    const byId = new Map(cs.map((c) => [c.registryId, c]));
    const withKi = rows.filter((r) => r.kiUm !== null);
    expect(withKi.length).toBeGreaterThanOrEqual(5); // INH-000002, 5, 6, 7, 12 of the invented table
    for (const r of rows) {
      const c = byId.get(r.compoundId)!;
      const pKi = pKiFromMicromolar(r.kiUm);
      const le = ligandEfficiency(pKi, c.heavyAtoms);
      const lipe = lipophilicEfficiency(pKi, c.clogp);
      if (pKi === null) expect(r.pKi).toBeNull();
      else expect(r.pKi).toBeCloseTo(pKi, 10);
      if (le === null) expect(r.le).toBeNull();
      else expect(r.le).toBeCloseTo(le, 10);
      if (lipe === null) expect(r.lipe).toBeNull();
      else expect(r.lipe).toBeCloseTo(lipe, 10);
    }
  });
});

describe("the headline Ki of an override", () => {
  // INVENTED fits of the four models for one compound, each constant different so the row shows
  // which one it took.
  type Ci = [number | null, number | null];
  const summary = (
    kicUm: number | null,
    kiuUm: number | null,
    alpha: number | null,
    kic: Ci,
    kiu: Ci,
  ): ModelSummary => ({
    vmax: 1,
    kmUm: 20,
    kicUm,
    kiuUm,
    alpha,
    se: { vmax: null, km: null, kic: null, kiu: null, a: null, b: null },
    ci95: { vmax: [null, null], km: [null, null], kic, kiu },
    rss: 1,
    aicc: 0,
    deltaAicc: 0,
    akaikeWeight: 0.25,
    fTestVsMixedP: null,
    dof: 36,
    converged: true,
  });
  const fits: Record<InhibitionModel, ModelSummary> = {
    competitive: summary(0.4, null, null, [0.3, 0.55], [null, null]),
    uncompetitive: summary(null, 1.5, 0, [null, null], [1.1, 2.2]),
    noncompetitive: summary(0.9, 0.9, 1, [0.7, 1.2], [0.7, 1.2]),
    mixed: summary(0.6, 2.4, 4, [0.45, 0.8], [1.5, null]),
  };

  it("gives the row, for each model, the Ki and 95 % CI that headlineKi gives for that model's fit", async () => {
    const id = "INH-000004"; // no mechanism result in the invented table
    const { experimentId } = await addAnalysis(
      w,
      runId,
      "mechanism",
      [{ id, ki: 0.4, mech: "competitive", label: "ambiguous" }],
      () => ({
        best: "competitive",
        label: "ambiguous",
        n: 40,
        weighting: "none",
        models: fits,
        points: [],
        backgroundSubtracted: false,
      }),
    );
    const t0 = Date.now();
    for (const [k, model] of INHIBITION_MODELS.entries()) {
      await db.insert(mechanismOverrides).values({
        experimentId,
        compoundId: id,
        model,
        reason: `test override to ${model} (invented)`,
        by: w.people.lead.id,
        at: new Date(t0 + (k + 1) * 1000),
      });
      await db.transaction((tx) => refreshHitRows(tx, w.campaignId, [id]));
      const r = await rowOf(id);
      const want = headlineKi(model, fits[model]);
      expect(r.mechanism).toBe(model);
      expect(r.mechanismLabel).toBe("override");
      expect(r.kiUm).toBe(want.kiUm);
      expect([r.kiLoUm, r.kiHiUm]).toEqual(want.ci95);
      expect(r.kicUm).toBe(fits[model].kicUm);
      expect(r.kiuUm).toBe(fits[model].kiuUm);
      expect(r.pKi).toBeCloseTo(pKiFromMicromolar(want.kiUm)!, 10);
    }
    // Kiu for uncompetitive, Kic for the other three (the record in headline-ki.ts).
    expect(headlineKi("uncompetitive", fits.uncompetitive).kiUm).toBe(1.5);
    expect(headlineKi("mixed", fits.mixed).kiUm).toBe(0.6);
  });
});
