// Difficult data through the whole pipeline against the real database and S3 fake: INVENTED
// plates written from known parameters (src/lib/analysis/testdata/difficult-cases.ts, with the
// plate simulator's noise and rate laws — not a reference) go through the plate map, upload, QC,
// acceptance, experiment settings, analysis and the hit grid. Each kind of data must come back
// with the right outcome, model or label, and never with a confident ("clear") wrong call; the
// settings that changed the fit are in the analysis's provenance. Tolerances as in
// src/lib/analysis/compute.test.ts (15 % on a constant, 2-fold next to a wild well).
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { and, eq, inArray } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns, hitRows } from "@/server/db/schema";
import { stopBoss } from "@/server/jobs/boss";
import { compoundId } from "@/lib/plates/demo-campaign";
import { doseResponseLayout, mechanismLayout } from "@/lib/plates/layouts";
import { writeGridText, writeLongEndpoint } from "@/lib/plates/export-writers";
import { plateMapToCsv, type PlateMap } from "@/lib/plates/plate-map";
import { seededNormal } from "@/lib/plates/simulate";
import { parsePlateMapCsv } from "@/lib/plates";
import { isCalledDoseResponse, isFittedDoseResponse, isFittedMechanism } from "@/lib/analysis/detail";
import {
  DOSE_CASES,
  ENZYME,
  MECHANISM_CASES,
  SUBSTRATES_UM,
  type DoseCase,
  type MechanismCase,
} from "@/lib/analysis/testdata/difficult-cases";
import { createPlateMap, decideRun, uploadRun } from "@/server/services/plates";
import type { Campaign } from "@/server/services/campaigns";
import { makeWorld, type World } from "@/test/harness";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { createExperiment, experimentResults, getAnalysis, requestAnalysis, runAnalysis } from ".";

const NOTE = "INVENTED difficult data for a pipeline test";
/** Registry IDs of the cases: dose-response INH-000001…7, mechanism INH-000008…12. */
const doseIds = new Map(DOSE_CASES.map((c, k) => [c.id, compoundId(1 + k)]));
const mechIds = new Map(MECHANISM_CASES.map((c, k) => [c.id, compoundId(1 + DOSE_CASES.length + k)]));

const within = (got: number | null | undefined, want: number, tol = 0.15) => {
  expect(got).not.toBeNull();
  expect(Math.abs(got! / want - 1)).toBeLessThanOrEqual(tol);
};

// ---------------------------------------------------------------- invented plates

const NEUTRAL = 12000;
const FULL = 1500;

/** An endpoint plate: each sample well reads full + (neutral − full)·(1 − inhibition/100) + noise. */
function doseResponsePlate(cases: readonly DoseCase[], seed: number): { map: PlateMap; file: string } {
  const map = doseResponseLayout(
    384,
    cases.map((c) => ({ compound: doseIds.get(c.id)!, topConcentrationUm: c.topUm })),
    { points: 10, dilutionFactor: 3, replicates: 2 },
  );
  const z = seededNormal(seed);
  const byId = new Map(cases.map((c) => [doseIds.get(c.id)!, c]));
  const seen = new Map<string, number>();
  const values = new Map<string, number>();
  for (const w of map.wells) {
    let v = FULL;
    if (w.role === "neutral") v = NEUTRAL;
    else if (w.role === "sample" && w.compound) {
      const c = byId.get(w.compound)!;
      const x = w.concentrationUm!;
      const key = `${w.compound}@${x}`;
      const replicate = seen.get(key) ?? 0;
      seen.set(key, replicate + 1);
      const top = Math.abs(x / c.topUm - 1) < 1e-9;
      // The wild well: the first replicate at the top concentration reads like the vehicle.
      const inh = c.wild && top && replicate === 0 ? c.wild[2] : c.inhibitionPct(x) + 3 * z();
      v = FULL + (NEUTRAL - FULL) * (1 - inh / 100);
    }
    values.set(w.well, Math.round(v + 60 * z()));
  }
  return { map, file: writeLongEndpoint(values, { notes: [NOTE] }) };
}

/** Kinetic reads every 10 s for 10 min: P(t) = v·t exactly (no depletion), v with the case's noise. */
function mechanismPlate(cases: readonly MechanismCase[], seed: number): { map: PlateMap; file: string } {
  const map = mechanismLayout(
    384,
    cases.map((c) => ({ compound: mechIds.get(c.id)!, inhibitorUm: c.inhibitorUm })),
    SUBSTRATES_UM,
    2,
    { substrateUm: 20 },
  );
  const z = seededNormal(seed);
  const byId = new Map(cases.map((c) => [mechIds.get(c.id)!, c]));
  const times = Array.from({ length: 60 }, (_, k) => k * 10);
  const curves = new Map<string, number[]>();
  for (const w of map.wells) {
    if (w.role === "empty") continue;
    let v = 0;
    if (w.role === "neutral") v = (ENZYME.vmaxUmPerS * 20) / (ENZYME.kmUm + 20);
    else if (w.role === "sample" && w.compound) {
      const c = byId.get(w.compound)!;
      const rate = c.rate(w.substrateUm!, w.concentrationUm ?? 0);
      v = rate + Math.sqrt(c.noiseSd ** 2 + (c.noiseCv * rate) ** 2) * z();
    }
    curves.set(
      w.well,
      times.map((t) => Number((200 + v * t + 2 * z()).toFixed(1))),
    );
  }
  const reads = times.map((timeS, k) => ({ timeS, values: new Map([...curves].map(([w, s]) => [w, s[k]!])) }));
  return { map, file: writeGridText(384, reads, { notes: [NOTE] }) };
}

async function uploadAccepted(w: World, campaign: Campaign, name: string, p: { map: PlateMap; file: string }) {
  const parsed = parsePlateMapCsv(plateMapToCsv(p.map), 384, `${name}.map.csv`);
  if (!parsed.ok) throw new Error(parsed.issues[0]!.text);
  const map = await createPlateMap(w.people.assay, w.campaignId, { name, map: parsed.map });
  const run = await uploadRun(w.people.assay, campaign, {
    plateMapId: map.id,
    fileName: `${name}.csv`,
    contentType: "text/csv",
    bytes: new TextEncoder().encode(p.file),
  });
  expect(run.qc.verdict, `${name}: ${JSON.stringify(run.qc)}`).toBe("pass");
  await decideRun(w.people.assay, w.campaignId, run.id, "accepted", "QC passes (test)");
  return run.id;
}

let w: World;
let campaign: Campaign;
const runs: Record<string, string> = {};

beforeAll(async () => {
  w = await makeWorld();
  const [c] = await db
    .update(campaigns)
    .set({ kmValue: 20, kmUnit: "µM", enzymeConcValue: 10, enzymeConcUnit: "nM" })
    .where(eq(campaigns.id, w.campaignId))
    .returning();
  campaign = c!;
  await ensureCompoundsRegistered([...doseIds.values(), ...mechIds.values()]);
  runs.dose = await uploadAccepted(w, campaign, "difficult-dose", doseResponsePlate(DOSE_CASES, 9100));
  // Blocks of up to 5 inhibitor levels in duplicate: two per row band, two bands on a 384-well plate.
  const [si, partial, tight, prop, mixed] = MECHANISM_CASES;
  runs.mechA = await uploadAccepted(w, campaign, "difficult-mech-a", mechanismPlate([partial!, tight!], 9200));
  runs.mechB = await uploadAccepted(w, campaign, "difficult-mech-b", mechanismPlate([si!, prop!, mixed!], 9300));
}, 240_000);
afterAll(() => stopBoss());

async function analysed(name: string, kind: "dose-response" | "mechanism", runIds: string[], settings = {}) {
  const e = await createExperiment(w.people.lead, campaign, { name, kind, runIds, settings });
  const a = await requestAnalysis(w.people.lead, campaign, e.id);
  await runAnalysis(a.id);
  const rows = await experimentResults(e.id);
  return { experimentId: e.id, analysis: await getAnalysis(w.campaignId, a.id), rows };
}

const hitRowsOf = async (ids: string[]) =>
  db
    .select()
    .from(hitRows)
    .where(and(eq(hitRows.campaignId, w.campaignId), inArray(hitRows.compoundId, ids)));

describe("dose-response plate with difficult compounds (invented)", () => {
  it("inactive, weak and activator get no IC50 and say why; partial and tight binder are flagged; the wild well is proposed", async () => {
    const { rows, analysis } = await analysed("Difficult DR", "dose-response", [runs.dose!]);
    const by = new Map(rows.map((r) => [r.compoundId, r]));
    const get = (id: string) => {
      const r = by.get(doseIds.get(id)!)!;
      if (r.kind !== "dose-response") throw new Error("expected a dose-response result");
      return r;
    };
    expect(analysis.inputs.settings.resolved).toMatchObject({ weighting: "auto", robust: false, enzymeNm: 10 });

    for (const id of ["inactive", "weak"]) {
      const r = get(id);
      expect(r.ic50Um, id).toBeNull();
      expect(r.flags).toContain("inactive");
      if (!isCalledDoseResponse(r.detail)) throw new Error(`${id}: expected no IC50`);
      expect(r.detail.reason).toMatch(/< 50 % inhibition at the top concentration .*maximum/);
    }
    if (!isCalledDoseResponse(get("weak").detail)) throw new Error("weak: expected no IC50");
    within((get("weak").detail as { maxInhibitionPct: number }).maxInhibitionPct, 29, 0.3);

    const act = get("activator");
    expect(act.ic50Um).toBeNull();
    expect(act.flags).toContain("activator");

    const partial = get("partial");
    expect(partial.flags).toContain("partial-inhibition");
    within(partial.ic50Um, 2, 0.3);

    const tight = get("tight-binder");
    expect(tight.flags).toContain("tight-binding-suspected");
    if (!isFittedDoseResponse(tight.detail) || !tight.detail.morrison || "error" in tight.detail.morrison)
      throw new Error("expected a Morrison fit");
    within(tight.detail.morrison.kAppUm, 0.001, 0.5);

    within(get("clean").ic50Um, 0.5);

    const wild = get("wild-well");
    if (!isFittedDoseResponse(wild.detail)) throw new Error("expected a fit");
    const proposed = wild.detail.outliers?.proposed ?? [];
    expect(proposed.map((o) => [o.runId, o.concentrationUm])).toContainEqual([runs.dose, 100]);
    expect(wild.detail.outliers?.reported).toBe("all-points");
    within(wild.detail.outliers?.other?.fit?.ic50Um, 1, 1);

    // The hit grid carries the outcome: no IC50 for the inactive compound, flagged.
    const [inactiveRow] = await hitRowsOf([doseIds.get("inactive")!]);
    expect(inactiveRow!.ic50Um).toBeNull();
    expect(inactiveRow!.flagged).toBe(true);
  });

  it("robust on (a setting, in the provenance) reports the IC50 without the wild well, within 2-fold", async () => {
    const { rows, analysis } = await analysed("Difficult DR robust", "dose-response", [runs.dose!], { robust: true });
    expect(analysis.inputs.settings.resolved).toMatchObject({ robust: true });
    const r = rows.find((x) => x.compoundId === doseIds.get("wild-well"))!;
    expect(r.flags).toContain("outliers-excluded");
    within(r.ic50Um, 1, 1);
    if (!isFittedDoseResponse(r.detail)) throw new Error("expected a fit");
    expect(r.detail.outliers?.reported).toBe("without-outliers");
  });
});

describe("mechanism plates with difficult compounds (invented; the campaign's [E] 10 nM)", () => {
  it("each comes back with the right model, Ki within 15 % and no clear wrong call; inadequate calls are flagged on the hit grid", async () => {
    const { rows, analysis } = await analysed("Difficult MoA", "mechanism", [runs.mechA!, runs.mechB!]);
    expect(analysis.inputs.settings.resolved).toMatchObject({ weighting: "auto", enzymeNm: 10 });
    const truth: Record<string, { recommended: RegExp; mechanism: string; ki: number; standard: boolean }> = {
      "substrate-inhibited": {
        recommended: /^substrate-inhibition-competitive$/,
        mechanism: "competitive",
        ki: 1,
        standard: false,
      },
      partial: { recommended: /^partial-(noncompetitive|mixed)$/, mechanism: "noncompetitive", ki: 1, standard: false },
      "tight-binder": {
        recommended: /^tight-binding-competitive$/,
        mechanism: "competitive",
        ki: 0.005,
        standard: false,
      },
      "proportional-noise": { recommended: /^competitive$/, mechanism: "competitive", ki: 1, standard: true },
      "mixed-clean": { recommended: /^mixed$/, mechanism: "mixed", ki: 1, standard: true },
    };
    const hits = new Map((await hitRowsOf([...mechIds.values()])).map((h) => [h.compoundId, h]));
    for (const c of MECHANISM_CASES) {
      const r = rows.find((x) => x.compoundId === mechIds.get(c.id))!;
      const t = truth[c.id]!;
      if (r.kind !== "mechanism" || !isFittedMechanism(r.detail)) throw new Error(`${c.id}: expected a mechanism fit`);
      expect(r.detail.recommended, c.id).toMatch(t.recommended);
      expect(r.mechanism, c.id).toBe(t.mechanism);
      within(r.kiUm, t.ki);
      if (r.mechanismLabel === "clear") expect(r.detail.best, c.id).toBe(t.mechanism);
      const hit = hits.get(r.compoundId)!;
      if (!t.standard) {
        expect(r.mechanismLabel, c.id).toBe("inadequate");
        expect(hit.mechanismLabel, c.id).toBe("inadequate");
        expect(hit.flagged, c.id).toBe(true);
        expect(hit.flags, c.id).toContain("mechanism-inadequate");
      }
      within(hit.kiUm, t.ki);
    }
    const prop = rows.find((x) => x.compoundId === mechIds.get("proportional-noise"))!;
    if (!isFittedMechanism(prop.detail)) throw new Error("expected a fit");
    expect(prop.detail.weightingDecision).toMatchObject({ used: "relative", chosen: "auto" });
  });
});
