import { describe, expect, it } from "vitest";
import { fitMechanism, type MechanismPoint } from "./mechanism-fit";
import { apparentKm, apparentVmax, inhibitedRate, INHIBITION_MODELS, type InhibitionModel } from "./inhibition-models";
import { doubleReciprocalLines, doubleReciprocalPoints } from "./double-reciprocal";
import { ISDALS_INHIBITOR } from "./testdata/reference-data";

describe("mechanism: isdals `inhibitor` matrix (Ekstrøm & Sørensen, R package isdals; values computed with SciPy 1.17)", () => {
  const r = fitMechanism(ISDALS_INHIBITOR);

  it("chooses competitive, labelled ambiguous (mixed within ΔAICc 0.46)", () => {
    expect(r.best).toBe("competitive");
    expect(r.label).toBe("ambiguous");
    expect(r.n).toBe(36);
  });

  it("competitive: Vmax 2.9383, Km 33.993, Ki 34.845 (SE 3.28), AICc −166.29", () => {
    const c = r.models.competitive;
    expect(c.vmax).toBeCloseTo(2.9383, 4);
    expect(c.km).toBeCloseTo(33.993, 3);
    expect(c.kic!).toBeCloseTo(34.845, 3);
    expect(c.se.kic!).toBeCloseTo(3.28, 2);
    expect(c.kiu).toBeNull();
    expect(c.alpha).toBeNull();
    expect(c.aicc).toBeCloseTo(-166.29, 2);
  });

  it("mixed AICc −166.75; F-test competitive vs mixed p = 0.0956", () => {
    expect(r.models.mixed.aicc).toBeCloseTo(-166.75, 2);
    expect(r.models.competitive.fTestVsMixed!.p).toBeCloseTo(0.0956, 4);
    expect(r.models.competitive.deltaAicc).toBeCloseTo(0.46, 2);
    const w = INHIBITION_MODELS.reduce((s, m) => s + r.models[m].akaikeWeight, 0);
    expect(w).toBeCloseTo(1, 12);
  });

  it("noncompetitive reports Kic = Kiu; JSON has no NaN", () => {
    expect(r.models.noncompetitive.kic).toBe(r.models.noncompetitive.kiu);
    expect(r.models.noncompetitive.alpha).toBe(1);
    expect(JSON.stringify(r)).not.toMatch(/NaN/);
  });

  it("does not depend on the units (concentrations ×1e-9 or ×1e3, rates ×1e4 or ×1e-9)", () => {
    for (const [cs, rs] of [
      [1e-9, 1e4],
      [1e3, 1e-9],
    ] as const) {
      const scaled = fitMechanism(
        ISDALS_INHIBITOR.map((p) => ({ substrate: p.substrate * cs, inhibitor: p.inhibitor * cs, rate: p.rate * rs })),
      );
      expect(scaled.best).toBe("competitive");
      expect(scaled.label).toBe("ambiguous");
      expect(scaled.models.competitive.kic! / cs).toBeCloseTo(34.845, 3);
      expect(scaled.models.competitive.vmax / rs).toBeCloseTo(2.9383, 4);
      expect(scaled.models.competitive.fTestVsMixed!.p).toBeCloseTo(0.0956, 4);
      expect(scaled.models.mixed.aicc - scaled.models.competitive.aicc).toBeCloseTo(-0.46, 2);
    }
  });

  it("is deterministic (same input, identical output)", () => {
    expect(JSON.stringify(fitMechanism(ISDALS_INHIBITOR))).toBe(JSON.stringify(r));
  });
});

describe("facts of the trade (common practice; Segel 1975, Cornish-Bowden [from memory])", () => {
  const c = { vmax: 10, km: 5, kic: 2, kiu: 2 };

  it("a noncompetitive inhibitor at [I] = Ki halves Vmax and leaves Km unchanged", () => {
    expect(apparentVmax(2, c)).toBeCloseTo(5, 12);
    expect(apparentKm(2, c)).toBeCloseTo(5, 12);
    for (const s of [0.5, 5, 50])
      expect(inhibitedRate("noncompetitive", s, 2, c)).toBeCloseTo(inhibitedRate("noncompetitive", s, 0, c) / 2, 12);
  });

  it("noncompetitive double-reciprocal lines share the x-intercept −1/Km", () => {
    const lines = doubleReciprocalLines({ vmax: 10, km: 5, kic: 2, kiu: 2 }, [0, 1, 2, 4], 0, 1);
    for (const l of lines) expect(l.xIntercept).toBeCloseTo(-1 / 5, 12);
  });

  it("a competitive inhibitor leaves Vmax unchanged and its lines meet on the y-axis", () => {
    expect(apparentVmax(100, { vmax: 10, km: 5, kic: 2 })).toBe(10);
    expect(inhibitedRate("competitive", 1e9, 10, c)).toBeCloseTo(10, 6);
    const lines = doubleReciprocalLines({ vmax: 10, km: 5, kic: 2, kiu: null }, [0, 1, 5], 0, 1);
    for (const l of lines) expect(l.intercept).toBeCloseTo(0.1, 12);
  });

  it("an uncompetitive inhibitor gives parallel double-reciprocal lines", () => {
    const lines = doubleReciprocalLines({ vmax: 10, km: 5, kic: null, kiu: 2 }, [0, 1, 5], 0, 1);
    for (const l of lines) expect(l.slope).toBeCloseTo(0.5, 12);
    expect(new Set(lines.map((l) => l.intercept.toFixed(6))).size).toBe(3);
  });

  it("mixed lines meet at 1/S = −1/(α·Km)", () => {
    const lines = doubleReciprocalLines({ vmax: 10, km: 5, kic: 2, kiu: 8 }, [1, 3], 0, 1);
    const [l1, l2] = lines as [(typeof lines)[0], (typeof lines)[0]];
    const x = (l2.intercept - l1.intercept) / (l1.slope - l2.slope);
    expect(x).toBeCloseTo(-1 / (4 * 5), 12);
  });

  it("double-reciprocal points skip rows without a reciprocal", () => {
    const t = doubleReciprocalPoints([
      { substrate: 0, inhibitor: 0, rate: 0 },
      { substrate: 2, inhibitor: 0, rate: 4 },
    ]);
    expect(t.skipped).toBe(1);
    expect(t.points[0]).toEqual({ inverseSubstrate: 0.5, inverseRate: 0.25, inhibitor: 0 });
  });
});

/** Exact (noise-free) matrix from a model: S = 2–200, I = 0–40, Km 20, Ki 10 (invented values). */
function exactMatrix(model: InhibitionModel, kic = 10, kiu = 10, withZeroSubstrate = false): MechanismPoint[] {
  const pts: MechanismPoint[] = [];
  for (const i of [0, 5, 10, 20, 40]) {
    for (const s of [...(withZeroSubstrate ? [0] : []), 2, 5, 10, 20, 50, 100, 200]) {
      pts.push({ substrate: s, inhibitor: i, rate: inhibitedRate(model, s, i, { vmax: 3, km: 20, kic, kiu }) });
    }
  }
  return pts;
}

describe("mechanism choice on exact data (common practice: the generating model must win, clearly)", () => {
  for (const model of INHIBITION_MODELS) {
    it(`${model} data → ${model}, clear`, () => {
      const r = fitMechanism(exactMatrix(model, 10, model === "mixed" ? 40 : 10));
      expect(r.best).toBe(model);
      expect(r.label).toBe("clear");
      expect(r.models[model].vmax).toBeCloseTo(3, 6);
      expect(r.models[model].km).toBeCloseTo(20, 5);
    });
  }

  it("exact data are adequate, need no model beyond the four and carry no flags", () => {
    for (const model of INHIBITION_MODELS) {
      const r = fitMechanism(exactMatrix(model, 10, model === "mixed" ? 40 : 10));
      expect(r.models[model].adequacy.adequate).toBe(true);
      expect(r.alternatives).toHaveLength(0);
      expect(r.flags).toEqual([]);
      expect(r.recommended).toMatchObject({ model, family: "standard", label: "clear" });
      expect(r.weightingChoice).toMatchObject({ requested: "none", used: "none", test: null });
    }
  });

  it("rows with substrate 0 are accepted and do not change the parameters", () => {
    const plain = fitMechanism(exactMatrix("competitive"));
    const zeros = fitMechanism(exactMatrix("competitive", 10, 10, true));
    expect(zeros.n).toBe(plain.n + 5);
    expect(zeros.best).toBe("competitive");
    expect(zeros.models.competitive.kic!).toBeCloseTo(10, 6);
  });

  it("a mixed fit at a boundary reports the missing constant as null, never NaN", () => {
    const r = fitMechanism(
      exactMatrix("competitive").map((p, k) => ({ ...p, rate: p.rate * (1 + 0.01 * Math.sin(k * 1.7)) })),
    );
    const mixed = r.models.mixed;
    const json = JSON.stringify(r);
    expect(json).not.toMatch(/NaN|Infinity/);
    if (mixed.b === 0) expect(mixed.kiu).toBeNull();
    expect(mixed.rss).toBeLessThanOrEqual(r.models.competitive.rss);
  });

  it("relative weighting leaves out substrate-0 rows and still recovers the model", () => {
    const r = fitMechanism(
      exactMatrix("uncompetitive", 10, 10, true).map((p) => (p.substrate === 0 ? { ...p, rate: 0 } : p)),
      { weighting: "relative" },
    );
    expect(r.n).toBe(35);
    expect(r.best).toBe("uncompetitive");
    expect(r.models.uncompetitive.kiu!).toBeCloseTo(10, 6);
  });

  it("refuses data that cannot separate the models, with a reason", () => {
    expect(() => fitMechanism(exactMatrix("competitive").filter((p) => p.inhibitor === 0))).toThrow(
      /inhibitor concentration/,
    );
    expect(() => fitMechanism(exactMatrix("competitive").slice(0, 5))).toThrow(/at least 7/);
  });
});
