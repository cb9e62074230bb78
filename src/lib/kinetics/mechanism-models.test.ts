/**
 * The models beyond the four: rate laws against published check values and facts of the trade,
 * analytic Jacobians against finite differences, and every extended model fitted by the engine
 * against R's minpack.lm::nlsLM (polished by base R's nls) on generated data, within 1 %. The
 * generated matrices are INVENTED (seeded noise from src/lib/plates/simulate.ts): the reference is
 * R's fit of the same numbers, written in the textbook parameterisation (testdata/
 * mechanism_models_oracle.R), not the engine's reciprocal constants.
 */
import { describe, expect, it } from "vitest";
import { fileURLToPath } from "node:url";
import { fitMechanism, type MechanismPoint } from "./mechanism-fit";
import {
  apparentKi,
  morrisonFraction,
  partialInhibitedRate,
  substrateInhibitedRate,
  tightBindingRate,
} from "./inhibition-models";
import {
  EXTENDED_MODELS,
  adequacyContext,
  extendedParameterCount,
  extendedProblem,
  extendedRate,
  type ExtendedModel,
  type ExtendedModelFit,
} from "./mechanism-models";
import { lackOfFitTest } from "./adequacy";
import { morrisonActivity, seededNormal } from "../plates/simulate";
import { runR } from "./testdata/r-oracle";
import { ISDALS_INHIBITOR } from "./testdata/reference-data";

describe("rate laws (Cheng & Prusoff 1973; Morrison 1969 and Copeland et al. 1995 check values in science.md, computed with SciPy)", () => {
  it("apparent Ki is the Cheng–Prusoff IC50: S = 10, Km = 5 → 3.0, 1.5, 1.0, 2.0; mixed at S = Km → 1.6", () => {
    expect(apparentKi(10, 5, 1, 0)).toBeCloseTo(3.0, 12);
    expect(apparentKi(10, 5, 0, 1)).toBeCloseTo(1.5, 12);
    expect(apparentKi(10, 5, 1, 1)).toBeCloseTo(1.0, 12);
    expect(apparentKi(10, 5, 1, 1 / 4)).toBeCloseTo(2.0, 12);
    expect(apparentKi(5, 5, 1, 1 / 4)).toBeCloseTo(1.6, 12);
    expect(apparentKi(5, 5, 0, 0)).toBe(Infinity);
  });

  it("tight binding: E = 10, K′ = 1 → v/v0 0.574166, 0.5, 0.270156, 0.084429 at I = 5, 6, 10, 20", () => {
    // Competitive with Km = 1 at S = 1: K′ = Kic(1 + S/Km) = 1 for Kic = 0.5; v0 = Vmax/2.
    const expected = [0.574166, 0.5, 0.270156, 0.084429];
    [5, 6, 10, 20].forEach((i, k) => {
      expect(tightBindingRate(1, i, 10, 1, 1, 2, 0) / 0.5).toBeCloseTo(expected[k]!, 6);
      expect(morrisonFraction(i, 10, 1)).toBeCloseTo(morrisonActivity(10, i, 1), 12);
    });
  });

  it("tight binding tends to the rapid-equilibrium model as E → 0 (free ≈ total inhibitor)", () => {
    for (const [s, i] of [
      [2, 0.5],
      [20, 3],
      [200, 30],
    ] as const) {
      const v = (1 * s) / (10 * (1 + 0.5 * i) + s * (1 + 0.1 * i));
      expect(tightBindingRate(s, i, 1e-9, 1, 10, 0.5, 0.1)).toBeCloseTo(v, 9);
    }
  });

  it("substrate inhibition: at I = 0 the rate peaks at S = √(Km·Ksi) (Haldane; Segel 1975 [from memory])", () => {
    const km = 5;
    const ksi = 100;
    const peak = Math.sqrt(km * ksi);
    const v = (s: number) => substrateInhibitedRate(s, 0, 10, km, 0, 0, 1 / ksi);
    expect(v(10)).toBeCloseTo(6.25, 12);
    expect(v(peak)).toBeGreaterThan(v(peak * 0.9));
    expect(v(peak)).toBeGreaterThan(v(peak * 1.1));
  });

  it("partial inhibition levels off at β·v0 for Kic = Kiu and at c(Km + S)/(a·Km + b·S)·v0 in general", () => {
    const v0 = (10 * 5) / (5 + 5);
    expect(partialInhibitedRate(5, 1e9, 10, 5, 1, 1, 0.4) / v0).toBeCloseTo(0.4, 6);
    const s = 20;
    const v0s = (10 * s) / (5 + s);
    expect(partialInhibitedRate(s, 1e9, 10, 5, 1, 0.25, 0.1) / v0s).toBeCloseTo((0.1 * (5 + s)) / (5 + 0.25 * s), 6);
    expect(partialInhibitedRate(5, 1000, 10, 5, 1, 1, 0.4)).toBeCloseTo(2.003, 3);
  });

  it("inhibitor depletion at E → 0: ∂v/∂E = Vmax·S/(Km + S)·I·q²/(1 + qI)³, q = 1/K′ (the score screen's column)", () => {
    for (const [s, i, a, b] of [
      [5, 2, 1, 0],
      [50, 0.5, 0.3, 2],
      [1, 10, 0, 0.7],
    ] as const) {
      const h = 1e-7;
      const numeric = (tightBindingRate(s, i, h, 1.3, 8, a, b) - tightBindingRate(s, i, 0, 1.3, 8, a, b)) / h;
      const q = (a * 8 + b * s) / (8 + s);
      const analytic = ((1.3 * s) / (8 + s)) * ((i * q * q) / (1 + q * i) ** 3);
      expect(numeric).toBeCloseTo(analytic, 5);
    }
  });
});

describe("extended models: analytic Jacobians agree with central differences (common practice)", () => {
  const pts = matrix((s, i) => substrateInhibitedRate(s, i, 1, 10, 0.5, 0.1, 0.01), S7, [0, 1, 3, 9], 11, 0.01);
  const d = toData(pts);
  it.each(EXTENDED_MODELS.map((m) => [m]))("%s", (model) => {
    const p = extendedParameterCount(model);
    const theta = Float64Array.from({ length: p }, (_, j) => [1.2, 8, 0.4, 0.15, 0.3][j]!);
    const problem = extendedProblem(model, d, 0.7);
    const r = new Float64Array(d.n);
    const jac = new Float64Array(d.n * p);
    problem.evaluate(theta, r, jac);
    for (let j = 0; j < p; j++) {
      const h = 1e-6 * Math.max(1, Math.abs(theta[j]!));
      const up = Float64Array.from(theta);
      const dn = Float64Array.from(theta);
      up[j] = up[j]! + h;
      dn[j] = dn[j]! - h;
      const ru = new Float64Array(d.n);
      const rd = new Float64Array(d.n);
      problem.evaluate(up, ru, null);
      problem.evaluate(dn, rd, null);
      for (let k = 0; k < d.n; k++) expect(jac[k * p + j]!).toBeCloseTo(-(ru[k]! - rd[k]!) / (2 * h), 6);
    }
  });
});

describe("adequacy context: the pure error computed once equals adequacy.ts's lack-of-fit test (isdals `inhibitor`)", () => {
  it("same F, p and degrees of freedom as lackOfFitTest for the competitive fit", () => {
    const d = toData(ISDALS_INHIBITOR);
    const fit = fitMechanism(ISDALS_INHIBITOR);
    const c = fit.models.competitive;
    const residual = ISDALS_INHIBITOR.map(
      (p) => p.rate - (c.vmax * p.substrate) / (c.km * (1 + p.inhibitor / c.kic!) + p.substrate),
    );
    const keys = ISDALS_INHIBITOR.map((p) => `${p.substrate}|${p.inhibitor}`);
    const shared = lackOfFitTest(keys, d.y, residual, 3)!;
    const ctx = adequacyContext(d);
    expect(ctx.groups).toBe(18);
    expect(ctx.replicates).toHaveLength(18);
    expect(c.adequacy.lackOfFit!.f).toBeCloseTo(shared.f, 8);
    expect(c.adequacy.lackOfFit!.p).toBeCloseTo(shared.p, 10);
    expect(c.adequacy.lackOfFit!.dfLof).toBe(shared.dfLof);
    expect(c.adequacy.lackOfFit!.dfPe).toBe(shared.dfPe);
  });
});

// ------------------------------------------------------------------------------ R oracle

const S6 = [2, 5, 10, 20, 50, 100];
const S7 = [...S6, 200];
const I_SI = [0, 1, 2, 4, 8];
const I_PARTIAL = [0, 0.3, 1, 3, 10, 30];
const I_TB = [0, 0.25, 0.5, 1, 2, 4];

interface OracleCase {
  model: ExtendedModel;
  rate: (s: number, i: number) => number;
  s: number[];
  i: number[];
  e?: number;
  /** R starting values (the invented truth, moved 20 %), textbook names. */
  start: Record<string, number>;
}

const km = 10;
const move = (v: number) => v * 1.2;
const CASES: OracleCase[] = [
  {
    model: "substrate-inhibition-competitive",
    rate: (s, i) => substrateInhibitedRate(s, i, 1, km, 0.5, 0, 1 / 80),
    s: S7,
    i: I_SI,
    start: { V: move(1), Km: move(km), Kic: move(2), Ksi: move(80) },
  },
  {
    model: "substrate-inhibition-uncompetitive",
    rate: (s, i) => substrateInhibitedRate(s, i, 1, km, 0, 0.25, 1 / 80),
    s: S7,
    i: I_SI,
    start: { V: move(1), Km: move(km), Kiu: move(4), Ksi: move(80) },
  },
  {
    model: "substrate-inhibition-noncompetitive",
    rate: (s, i) => substrateInhibitedRate(s, i, 1, km, 0.3, 0.3, 1 / 80),
    s: S7,
    i: I_SI,
    start: { V: move(1), Km: move(km), Ki: move(3.3), Ksi: move(80) },
  },
  {
    model: "substrate-inhibition-mixed",
    rate: (s, i) => substrateInhibitedRate(s, i, 1, km, 0.5, 0.125, 1 / 80),
    s: S7,
    i: I_SI,
    start: { V: move(1), Km: move(km), Kic: move(2), Kiu: move(8), Ksi: move(80) },
  },
  {
    model: "partial-competitive",
    rate: (s, i) => partialInhibitedRate(s, i, 1, km, 1, 0.2, 0.2),
    s: S6,
    i: I_PARTIAL,
    start: { V: move(1), Km: move(km), Kic: move(1), Kiu: move(5) },
  },
  {
    model: "partial-uncompetitive",
    rate: (s, i) => partialInhibitedRate(s, i, 1, km, 0, 0.5, 0.15),
    s: S6,
    i: I_PARTIAL,
    start: { V: move(1), Km: move(km), Kiu: move(2), beta: 0.3 * 1.2 },
  },
  {
    model: "partial-noncompetitive",
    rate: (s, i) => partialInhibitedRate(s, i, 1, km, 1, 1, 0.4),
    s: S6,
    i: I_PARTIAL,
    start: { V: move(1), Km: move(km), Ki: move(1), beta: 0.4 * 1.2 },
  },
  {
    model: "partial-mixed",
    rate: (s, i) => partialInhibitedRate(s, i, 1, km, 1, 0.25, 0.075),
    s: S6,
    i: I_PARTIAL,
    start: { V: move(1), Km: move(km), Kic: move(1), Kiu: move(4), beta: 0.3 * 1.2 },
  },
  {
    model: "tight-binding-competitive",
    rate: (s, i) => tightBindingRate(s, i, 1, 1, km, 2, 0),
    s: S6,
    i: I_TB,
    e: 1,
    start: { V: move(1), Km: move(km), Kic: move(0.5) },
  },
  {
    model: "tight-binding-uncompetitive",
    rate: (s, i) => tightBindingRate(s, i, 1, 1, km, 0, 2),
    s: S6,
    i: I_TB,
    e: 1,
    start: { V: move(1), Km: move(km), Kiu: move(0.5) },
  },
  {
    model: "tight-binding-noncompetitive",
    rate: (s, i) => tightBindingRate(s, i, 1, 1, km, 1.5, 1.5),
    s: S6,
    i: I_TB,
    e: 1,
    start: { V: move(1), Km: move(km), Ki: move(0.67) },
  },
  {
    model: "tight-binding-mixed",
    rate: (s, i) => tightBindingRate(s, i, 1, 1, km, 2, 0.5),
    s: S6,
    i: I_TB,
    e: 1,
    start: { V: move(1), Km: move(km), Kic: move(0.5), Kiu: move(2) },
  },
];

const R_SCRIPT = fileURLToPath(new URL("./testdata/mechanism_models_oracle.R", import.meta.url));
const data = CASES.map((c, k) => matrix(c.rate, c.s, c.i, 500 + k, 0.015));
const rLines: string[] = [];
CASES.forEach((c, k) => {
  const start = Object.entries(c.start)
    .map(([n, v]) => `${n}=${v}`)
    .join(";");
  rLines.push(`#${c.model}|${c.model}|${c.e ?? 0}|${start}`);
  for (const p of data[k]!) rLines.push(`${p.substrate},${p.inhibitor},${p.rate.toPrecision(17)}`);
});
const rOut = runR(
  `source(${JSON.stringify(R_SCRIPT)})\nfit_blocks(c(${rLines.map((l) => JSON.stringify(l)).join(",\n")}))\n`,
);
const rFits = new Map<string, Map<string, [number, number]>>();
for (const line of rOut.split("\n")) {
  const [id, name, est, se] = line.split(",");
  if (!id || !name) continue;
  if (!rFits.has(id)) rFits.set(id, new Map());
  rFits.get(id)!.set(name, [Number(est), Number(se)]);
}

const ESTIMATE_OF: Record<string, (a: ExtendedModelFit) => { value: number | null; se: number | null }> = {
  V: (a) => a.vmax,
  Km: (a) => a.km,
  Kic: (a) => a.kic,
  Kiu: (a) => a.kiu,
  Ki: (a) => a.kic,
  Ksi: (a) => a.ksi!,
  beta: (a) => a.beta!,
};

describe("extended models vs R minpack.lm::nlsLM + nls (invented seeded matrices, textbook parameterisation in R)", () => {
  it.each(CASES.map((c, k) => [c.model, k] as const))("%s: constants and SEs within 1 %, same RSS", (model, k) => {
    const c = CASES[k]!;
    const fit = fitMechanism(data[k]!, { extendedModels: "all", ...(c.e ? { enzymeConc: c.e } : {}) });
    const alt = fit.alternatives.find((a) => a.model === model)!;
    expect(alt).toBeDefined();
    const ref = rFits.get(model)!;
    expect(ref).toBeDefined();
    for (const [name, [est, se]] of ref) {
      if (name === "rss") {
        expect(Math.abs(alt.rss - est) / est).toBeLessThan(1e-6);
        continue;
      }
      const mine = ESTIMATE_OF[name]!(alt);
      expect(Math.abs(mine.value! - est) / Math.abs(est)).toBeLessThan(0.01);
      expect(Math.abs(mine.se! - se) / se).toBeLessThan(0.01);
    }
    expect(alt.converged).toBe(true);
    expect(alt.nParams).toBe(ref.size - 1);
    // The reported parameter vector reproduces the reported RSS through the rate law.
    const rss = data[k]!.reduce(
      (acc, p) => acc + (p.rate - extendedRate(model, alt.theta, p.substrate, p.inhibitor, c.e ?? 0)) ** 2,
      0,
    );
    expect(rss).toBeCloseTo(alt.rss, 12);
  });

  it("the lack-of-fit F and p of the isdals competitive and mixed fits match R (nls vs the one-way cell model)", () => {
    const lines = (model: string, start: string) => [
      `#${model}|${model}|0|${start}`,
      ...ISDALS_INHIBITOR.map((p) => `${p.substrate},${p.inhibitor},${p.rate}`),
    ];
    const out = runR(
      `source(${JSON.stringify(R_SCRIPT)})\nfit_blocks(c(${[
        ...lines("lof-competitive", "V=3;Km=30;Kic=30"),
        ...lines("lof-mixed", "V=3;Km=30;Kic=30;Kiu=300"),
      ]
        .map((l) => JSON.stringify(l))
        .join(",")}))\n`,
    );
    const get = (id: string, name: string) =>
      out
        .split("\n")
        .find((l) => l.startsWith(`${id},${name},`))!
        .split(",")
        .slice(2)
        .map(Number);
    const fit = fitMechanism(ISDALS_INHIBITOR);
    for (const [id, model] of [
      ["lof-competitive", "competitive"],
      ["lof-mixed", "mixed"],
    ] as const) {
      const lof = fit.models[model].adequacy.lackOfFit!;
      expect(Math.abs(lof.f - get(id, "lofF")[0]!) / get(id, "lofF")[0]!).toBeLessThan(0.01);
      expect(Math.abs(lof.p - get(id, "lofP")[0]!) / get(id, "lofP")[0]!).toBeLessThan(0.01);
      expect([lof.dfLof, lof.dfPe]).toEqual(get(id, "lofDf"));
    }
  });
});

// ------------------------------------------------------------------------------ helpers

/** An INVENTED substrate × inhibitor matrix in duplicate with normal noise of SD `sd`. */
function matrix(
  rate: (s: number, i: number) => number,
  sList: readonly number[],
  iList: readonly number[],
  seed: number,
  sd: number,
): MechanismPoint[] {
  const z = seededNormal(seed);
  const out: MechanismPoint[] = [];
  for (const i of iList)
    for (const s of sList)
      for (let r = 0; r < 2; r++) out.push({ substrate: s, inhibitor: i, rate: rate(s, i) + sd * z() });
  return out;
}

function toData(pts: readonly MechanismPoint[]) {
  return {
    s: Float64Array.from(pts, (p) => p.substrate),
    i: Float64Array.from(pts, (p) => p.inhibitor),
    y: Float64Array.from(pts, (p) => p.rate),
    w: new Float64Array(pts.length).fill(1),
    n: pts.length,
  };
}
