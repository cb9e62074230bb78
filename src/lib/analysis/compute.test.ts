/**
 * The pipeline's per-compound analysis on difficult INVENTED data (testdata/difficult-cases.ts:
 * generated from known parameters with the plate simulator's rate laws and the extended rate
 * laws of science.md — not a reference by itself). Each kind of data must come back with the
 * right outcome, model or label, and never with a confident wrong call: a "clear" mechanism must
 * be the true one. Tolerances: 15 % on a constant (common practice for a replicated assay), 2-fold
 * on an IC50 next to a wild well (the bar), 50 % on a tight binder's K′ (it sits at a
 * tenth of [E], where an IC50 = K′ + E/2 fixes it only loosely).
 */
import { describe, expect, it } from "vitest";
import { analyseDoseResponse, analyseMechanism, type AnalysisReading, type CompoundResult } from "./compute";
import {
  isCalledDoseResponse,
  isFittedDoseResponse,
  isFittedMechanism,
  parseResultDetail,
  type DoseResponseDetail,
} from "./detail";
import { mixedRateReciprocal } from "@/lib/kinetics/inhibition-models";
import { seededNormal } from "@/lib/plates/simulate";
import { DOSE_CASES, ENZYME_UM, MECHANISM_CASES, doseSeries, mechanismRates } from "./testdata/difficult-cases";

const within = (got: number | null | undefined, want: number, tol = 0.15) => {
  expect(got).not.toBeNull();
  expect(got).toBeDefined();
  expect(Math.abs(got! / want - 1)).toBeLessThanOrEqual(tol);
};

const reading = (r: Partial<AnalysisReading> & { well: string; compoundId: string }): AnalysisReading => ({
  runId: "run-1",
  role: "sample",
  concentrationUm: null,
  substrateUm: null,
  signal: null,
  inhibitionPct: null,
  masked: false,
  ...r,
});

const doseReadings = DOSE_CASES.flatMap((c, k) =>
  doseSeries(c, 7100 + k).map((p, j) =>
    reading({ compoundId: c.id, well: `W${j}`, concentrationUm: p.concentrationUm, inhibitionPct: p.inhibitionPct }),
  ),
);
const mechanismReadings = MECHANISM_CASES.flatMap((c, k) =>
  mechanismRates(c, 7200 + k).map((p, j) =>
    reading({
      compoundId: c.id,
      well: `W${j}`,
      substrateUm: p.substrateUm,
      concentrationUm: p.inhibitorUm,
      signal: p.rate,
    }),
  ),
);

const byId = (results: CompoundResult[]) => new Map(results.map((r) => [r.compoundId, r]));
const dose = byId(analyseDoseResponse(doseReadings, { enzymeUm: ENZYME_UM }));
const doseRobust = byId(analyseDoseResponse(doseReadings, { enzymeUm: ENZYME_UM, robust: true }));
const mech = byId(analyseMechanism(mechanismReadings, { enzymeUm: ENZYME_UM }));

function doseDetail(id: string, from = dose): DoseResponseDetail {
  return parseResultDetail("dose-response", from.get(id)!.detail);
}

describe("dose-response: difficult invented curves", () => {
  it("an ordinary inhibitor is fitted, IC50 within 15 % (0.5 µM), without outcome flags", () => {
    const r = dose.get("clean")!;
    within(r.ic50Um, 0.5);
    expect(isFittedDoseResponse(doseDetail("clean"))).toBe(true);
    for (const f of ["inactive", "activator", "not-determined", "partial-inhibition"]) expect(r.flags).not.toContain(f);
  });

  it("a partial inhibitor is fitted and flagged partial, its plateau near 65 %", () => {
    const r = dose.get("partial")!;
    const d = doseDetail("partial");
    expect(r.flags).toContain("partial-inhibition");
    if (!isFittedDoseResponse(d)) throw new Error("expected a fit");
    within(d.fit.topPct, 65, 0.1);
    within(r.ic50Um, 2, 0.25);
  });

  it("an inactive compound has no IC50 and says < 50 % at the top concentration, with the maximum", () => {
    const r = dose.get("inactive")!;
    const d = doseDetail("inactive");
    expect(r.ic50Um).toBeNull();
    expect(r.flags).toContain("inactive");
    if (!isCalledDoseResponse(d)) throw new Error("expected an outcome without IC50");
    expect(d.outcome).toBe("inactive");
    // The pipeline's concentrations are µM and its sentences say so.
    expect(d.reason).toMatch(/^< 50 % inhibition at the top concentration \d[\d.]* µM: maximum/);
    expect(Math.abs(d.maxInhibitionPct!)).toBeLessThan(10);
  });

  it("a weak inhibitor (29 % at the top) is inactive with its maximum shown", () => {
    const r = dose.get("weak")!;
    const d = doseDetail("weak");
    expect(r.ic50Um).toBeNull();
    if (!isCalledDoseResponse(d)) throw new Error("expected an outcome without IC50");
    expect(d.outcome).toBe("inactive");
    within(d.maxInhibitionPct, 29, 0.25);
    expect(d.reason).toMatch(/< 50 % inhibition at the top concentration .*maximum 3\d(\.\d+)? %/);
  });

  it("an activator is named as such, with no IC50", () => {
    const r = dose.get("activator")!;
    const d = doseDetail("activator");
    expect(r.ic50Um).toBeNull();
    expect(r.flags).toContain("activator");
    if (!isCalledDoseResponse(d)) throw new Error("expected an outcome without IC50");
    expect(d.outcome).toBe("activator");
    expect(d.maxActivationPct!).toBeGreaterThan(40);
  });

  it("one wild well is proposed as an outlier (not dropped); robust on reports the fit without it", () => {
    const d = doseDetail("wild-well");
    const wild = { concentrationUm: 100, inhibitionPct: 0 };
    if (!isFittedDoseResponse(d)) throw new Error("expected a fit");
    expect(d.outliers?.reported).toBe("all-points");
    expect(d.outliers?.proposed).toContainEqual(expect.objectContaining(wild));
    expect(d.points).toHaveLength(20);
    within(d.outliers?.other?.fit?.ic50Um, 1, 1); // the fit without it, within 2-fold of the truth
    within(dose.get("wild-well")!.ic50Um, 1, 1);

    const rr = doseRobust.get("wild-well")!;
    const dr = doseDetail("wild-well", doseRobust);
    expect(rr.flags).toContain("outliers-excluded");
    within(rr.ic50Um, 1, 1);
    if (!isFittedDoseResponse(dr)) throw new Error("expected a fit");
    expect(dr.outliers?.reported).toBe("without-outliers");
    expect(dr.outliers?.proposed).toContainEqual(expect.objectContaining(wild));
    expect(dr.points).toHaveLength(20);
  });

  it("a tight binder is flagged and the Morrison fit recovers K′ (1 nM at 10 nM enzyme)", () => {
    const r = dose.get("tight-binder")!;
    const d = doseDetail("tight-binder");
    expect(r.flags).toContain("tight-binding-suspected");
    if (!isFittedDoseResponse(d) || !d.morrison || "error" in d.morrison) throw new Error("expected a Morrison fit");
    within(d.morrison.kAppUm, 0.001, 0.5);
  });

  it("every detail parses with the stored schema and survives a JSON round trip", () => {
    for (const m of [dose, doseRobust])
      for (const r of m.values()) {
        const stored = JSON.parse(JSON.stringify(r.detail)) as unknown;
        expect(parseResultDetail("dose-response", stored)).toEqual(r.detail);
      }
  });
});

describe("mechanism: difficult invented matrices ([E] 10 nM known, weighting auto)", () => {
  // `standard`: whether one of the four standard models is the truth (else none of them may be "clear").
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

  for (const c of MECHANISM_CASES) {
    it(`${c.what}: the right model, Ki within 15 %, and no clear wrong call`, () => {
      const r = mech.get(c.id)!;
      const t = truth[c.id]!;
      const d = parseResultDetail("mechanism", r.detail);
      if (!isFittedMechanism(d)) throw new Error(`expected a fit: ${JSON.stringify(r.detail).slice(0, 200)}`);
      expect(d.recommended, c.id).toMatch(t.recommended);
      expect(r.mechanism, c.id).toBe(t.mechanism);
      within(r.kiUm, t.ki);
      // Never confidently wrong: "clear" only for a standard model that is the truth.
      if (r.mechanismLabel === "clear") {
        expect(d.recommended).toBe(t.mechanism);
        expect(d.best).toBe(t.mechanism);
      }
      if (!t.standard) {
        expect(r.mechanismLabel).toBe("inadequate");
        expect(r.flags).toContain("mechanism-inadequate");
        expect(d.labelReasons!.length).toBeGreaterThan(0);
        const alt = d.alternatives!.find((a) => a.model === d.recommended)!;
        expect(alt.meaning.length).toBeGreaterThan(20);
        expect(alt.adequacy?.adequate).toBe(true);
      }
    });
  }

  it("proportional noise: relative weighting is chosen from the replicates and said so", () => {
    const d = parseResultDetail("mechanism", mech.get("proportional-noise")!.detail);
    if (!isFittedMechanism(d)) throw new Error("expected a fit");
    expect(d.weightingDecision).toMatchObject({ used: "relative", chosen: "auto" });
    expect(d.weightingDecision!.reason).toMatch(/SD grows/);
    expect(d.weighting).toBe("relative");
  });

  it("the tight-binding check uses the enzyme concentration it was given", () => {
    const d = parseResultDetail("mechanism", mech.get("tight-binder")!.detail);
    if (!isFittedMechanism(d)) throw new Error("expected a fit");
    expect(d.enzymeUm).toBe(ENZYME_UM);
    expect(d.screens?.tightBinding?.near).toBe(true);
    // Without [E] the depletion-aware model cannot be fitted: the call must still not be clear and wrong.
    const [without] = analyseMechanism(mechanismReadings.filter((x) => x.compoundId === "tight-binder"));
    if (without!.mechanismLabel === "clear") expect(without!.mechanism).toBe("competitive");
  });

  it("every sentence that names a constant or a concentration says which and gives its unit (µM)", () => {
    let named = 0;
    for (const r of mech.values()) {
      const d = parseResultDetail("mechanism", r.detail);
      if (!isFittedMechanism(d)) throw new Error("expected a fit");
      const texts = [
        ...(d.labelReasons ?? []),
        ...(d.alternatives ?? []).flatMap((a) => [a.meaning, a.exclusion ?? ""]),
        ...(d.screens?.fitted ?? []).map((f) => f.why),
        d.recommendedReason ?? "",
        d.weightingDecision?.reason ?? "",
      ];
      for (const t of texts)
        for (const m of t.matchAll(/(Kic|Kiu|Ksi|\[E\]) \(?(about |CI of \w+ )?(-?\d[\d.]*(e[+-]?\d+)?)(.{0,3})/g)) {
          named++;
          expect(m[5], `${m[0]} in: ${t}`).toMatch(/^ µM/);
        }
      // No bare "Ki 1.2" or "Row 12": the constant is named (Kic or Kiu) and rows are wells.
      for (const t of texts) expect(t).not.toMatch(/\bKi \d|\b[Rr]ows? \d/);
    }
    expect(named).toBeGreaterThan(10);
  });

  it("every model of the four carries its adequacy, and the detail survives a JSON round trip", () => {
    for (const r of mech.values()) {
      const d = parseResultDetail("mechanism", JSON.parse(JSON.stringify(r.detail)) as unknown);
      expect(d).toEqual(r.detail);
      if (!isFittedMechanism(d)) throw new Error("expected a fit");
      for (const m of Object.values(d.models)) expect(m.adequacy?.runs.expected).toBeGreaterThan(0);
    }
  });
});

describe("mechanism outlier proposals in the result detail (invented: competitive matrix, Ki 2 µM, one rate 40 % high)", () => {
  const z = seededNormal(77);
  const readings: AnalysisReading[] = [];
  for (const i of [0, 1, 2, 4, 8])
    for (const s of [2, 5, 10, 20, 50, 100])
      for (let rep = 0; rep < 2; rep++) {
        const rate = mixedRateReciprocal(s, i, 1, 10, 0.5, 0) * (1 + 0 * z()) + 0.01 * z();
        readings.push(
          reading({
            compoundId: "wild",
            well: `W${readings.length}`,
            substrateUm: s,
            concentrationUm: i,
            signal: rate,
          }),
        );
      }
  readings[27] = { ...readings[27]!, signal: readings[27]!.signal! * 1.4 };

  it("each proposed well carries its name, [S], [I], observed rate, standardised residual and ROUT p", () => {
    const [r] = analyseMechanism(readings, { weighting: "none" });
    const d = parseResultDetail("mechanism", r!.detail);
    if (!isFittedMechanism(d)) throw new Error("expected a fit");
    expect(d.outliers!.checked).toBe("rout");
    expect(d.outliers!.proposed).toHaveLength(1);
    const o = d.outliers!.proposed[0]!;
    expect(o).toMatchObject({ runId: "run-1", well: "W27", substrateUm: 5, inhibitorUm: 2 });
    expect(o.rate).toBeCloseTo(readings[27]!.signal!, 8);
    // ROUT's rule (Motulsky & Brown 2006 [from memory]): flagged when p ≤ Q·rank/n (Benjamini–Hochberg), so
    // the single proposal has p ≤ Q/n and a residual far beyond the robust SD.
    expect(o.residual!).toBeGreaterThan(5);
    expect(o.p!).toBeGreaterThan(0);
    expect(o.p!).toBeLessThanOrEqual(d.outliers!.q / d.n);
    expect(Math.abs(o.residual!)).toBeCloseTo(d.outliers!.largestStandardized!, -1);
    expect(d.labelReasons).toContainEqual(
      expect.stringMatching(
        /^Well W27 looks like an outlier of the competitive fit .*the call is competitive, Kic \d[\d.]* µM\./,
      ),
    );
  });
});
