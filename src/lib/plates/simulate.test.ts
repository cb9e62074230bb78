// Checks of the simulator's forward models against outside references:
// - Cheng & Prusoff, Biochem Pharmacol 1973;22:3099 — IC50 worked values computed from its equations (S = 10, Km = 5).
// - Morrison, Biochim Biophys Acta 1969;185:269 [mem] — values computed with SciPy (E = 10 nM, K′ = 1 nM), and the
//   binding equilibrium solved independently with SciPy's brentq.
// - Four-parameter logistic: R `datasets::DNase` run 1 with the parameters fitted by SciPy (same model as R SSfpl)
//   [src data, calc fit]; the residual sum of squares must come back as 0.0047073.
// - Progress curves with substrate depletion: SciPy's solve_ivp (an outside ODE solver).
// - Gaussian noise: SciPy's Kolmogorov–Smirnov test against the standard normal.
import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import * as ss from "simple-statistics";
import { emptyPlateMap } from "./plate-map";
import { assignWells, selectColumns } from "./editor";
import {
  expectedZPrime,
  fourParameterLogistic,
  fractionalActivity,
  morrisonActivity,
  productCurve,
  seededNormal,
  seededUniform,
  simulateEndpointPlate,
  simulateKineticPlate,
  steadyStateRate,
  trueIc50Um,
  type CompoundTruth,
} from "./simulate";

function python(code: string, input: unknown): unknown {
  return JSON.parse(execFileSync("python3", ["-c", code], { input: JSON.stringify(input) }).toString());
}

describe("steady-state models and Cheng–Prusoff (Cheng & Prusoff 1973 worked checks, S = 10, Km = 5)", () => {
  const enzyme = { vmaxUmPerS: 1, kmUm: 5 };
  const cases: [string, CompoundTruth, number, number][] = [
    ["competitive Ki 1", { id: "X", kind: "mechanism", model: "competitive", kicUm: 1 }, 10, 3.0],
    ["uncompetitive Kiu 1", { id: "X", kind: "mechanism", model: "uncompetitive", kiuUm: 1 }, 10, 1.5],
    ["noncompetitive Ki 1", { id: "X", kind: "mechanism", model: "noncompetitive", kicUm: 1 }, 10, 1.0],
    ["mixed Kic 1, Kiu 4", { id: "X", kind: "mechanism", model: "mixed", kicUm: 1, kiuUm: 4 }, 10, 2.0],
    ["mixed Kic 1, Kiu 4 at S = Km", { id: "X", kind: "mechanism", model: "mixed", kicUm: 1, kiuUm: 4 }, 5, 1.6],
  ];
  for (const [name, c, s, ic50] of cases) {
    it(`${name}: IC50 ${ic50} and half activity there`, () => {
      expect(trueIc50Um(c, s, 5)).toBeCloseTo(ic50, 12);
      expect(fractionalActivity(c, ic50, s, enzyme)).toBeCloseTo(0.5, 12);
    });
  }

  it("reduces to Michaelis–Menten without inhibitor: v(Km) = Vmax/2", () => {
    expect(steadyStateRate({ vmaxUmPerS: 2, kmUm: 5 }, 5, 0)).toBe(1);
    expect(steadyStateRate({ vmaxUmPerS: 2, kmUm: 5 }, 5, 3, Infinity, Infinity)).toBe(1);
  });
});

describe("Morrison tight binding (E = 10 nM, K′ = 1 nM)", () => {
  it("matches the worked values and an independent root of the binding equilibrium (SciPy brentq)", () => {
    const expected: [number, number][] = [
      [5, 0.574166],
      [6, 0.5],
      [10, 0.270156],
      [20, 0.084429],
    ];
    for (const [i, v] of expected) expect(morrisonActivity(10, i, 1)).toBeCloseTo(v, 6);
    const is = [0.01, 0.5, 3, 6, 50, 1000];
    const ref = python(
      "import json,sys\nfrom scipy.optimize import brentq\nE,K=10.0,1.0\nout=[]\nfor I in json.load(sys.stdin):\n  EI=brentq(lambda x:(E-x)*(I-x)-K*x,0,min(E,I),xtol=1e-15,rtol=1e-15)\n  out.append((E-EI)/E)\nprint(json.dumps(out))",
      is,
    ) as number[];
    is.forEach((i, k) => expect(morrisonActivity(10, i, 1)).toBeCloseTo(ref[k]!, 10));
    const tb: CompoundTruth = { id: "X", kind: "tight-binding", kiAppUm: 0.001, enzymeUm: 0.01 };
    expect(trueIc50Um(tb)).toBeCloseTo(0.006, 12); // IC50 = K′ + E/2, Copeland et al. 1995
    expect(fractionalActivity(tb, 0.006)).toBeCloseTo(0.5, 12);
  });
});

describe("four-parameter logistic", () => {
  it("reproduces the published DNase run 1 fit (RSS 0.0047073)", () => {
    // R datasets::DNase run 1 (conc as in R: 0.048828125, then 0.1953125 … 12.5, duplicates).
    const conc = [0.048828125, 0.1953125, 0.390625, 0.78125, 1.5625, 3.125, 6.25, 12.5].flatMap((c) => [c, c]);
    const density = [
      0.017, 0.018, 0.121, 0.124, 0.206, 0.215, 0.377, 0.374, 0.614, 0.609, 1.019, 1.001, 1.334, 1.364, 1.73, 1.71,
    ];
    // A rising curve is the same model with a negative slope in this form.
    const p = { bottom: -0.0078971, top: 2.37724, ic50: 4.515, hill: -0.94111 };
    const rss = conc.reduce((acc, c, k) => acc + (density[k]! - fourParameterLogistic(c, p)) ** 2, 0);
    expect(rss).toBeCloseTo(0.0047073, 6);
  });

  it("gives a partial inhibitor a floor above zero", () => {
    const c: CompoundTruth = { id: "X", kind: "partial", ic50Um: 2, hill: 1, residualActivity: 0.35 };
    expect(fractionalActivity(c, 2)).toBeCloseTo(0.675, 12);
    expect(fractionalActivity(c, 1e6)).toBeCloseTo(0.35, 5);
  });
});

describe("progress curves", () => {
  const enzyme = { vmaxUmPerS: 0.05, kmUm: 20 };
  const timesS = [0, 30, 60, 120, 300, 600, 1200];

  it("are exactly linear without depletion", () => {
    const p = productCurve({ enzyme, s0Um: 10, iUm: 1, kicUm: 2, timesS, depletion: false });
    const v0 = steadyStateRate(enzyme, 10, 1, 2);
    p.forEach((x, k) => expect(x).toBeCloseTo(v0 * timesS[k]!, 12));
  });

  it("follow SciPy's solve_ivp with substrate depletion (mixed inhibition)", () => {
    const o = { enzyme, s0Um: 10, iUm: 1.5, kicUm: 1, kiuUm: 4, timesS, depletion: true };
    const ours = productCurve(o);
    const ref = python(
      [
        "import json,sys",
        "from scipy.integrate import solve_ivp",
        "d=json.load(sys.stdin)",
        "V,K,I,a,b=d['V'],d['K'],d['I'],1/d['kic'],1/d['kiu']",
        "f=lambda t,s:[-V*s[0]/(K*(1+a*I)+s[0]*(1+b*I))]",
        "r=solve_ivp(f,(0,max(d['t'])),[d['s0']],t_eval=d['t'],rtol=1e-11,atol=1e-13,method='DOP853')",
        "print(json.dumps([d['s0']-s for s in r.y[0]]))",
      ].join("\n"),
      { V: 0.05, K: 20, I: 1.5, kic: 1, kiu: 4, s0: 10, t: timesS },
    ) as number[];
    ours.forEach((x, k) => expect(x).toBeCloseTo(ref[k]!, 8));
    // Early on the curve is still close to the initial rate; late it falls well below it.
    const v0 = steadyStateRate(enzyme, 10, 1.5, 1, 4);
    expect(ours[1]! / (v0 * 30)).toBeGreaterThan(0.98);
    expect(ours[6]! / (v0 * 1200)).toBeLessThan(0.8);
  });
});

describe("seeded noise", () => {
  it("is deterministic and standard normal (SciPy Kolmogorov–Smirnov test)", () => {
    const a = seededNormal(7);
    const b = seededNormal(7);
    const draws = Array.from({ length: 5000 }, () => a());
    expect(Array.from({ length: 5000 }, () => b())).toEqual(draws);
    expect(seededUniform(1)()).not.toBe(seededUniform(2)());
    const p = python(
      "import json,sys\nfrom scipy.stats import kstest\nprint(json.dumps(kstest(json.load(sys.stdin),'norm').pvalue))",
      draws,
    ) as number;
    expect(p).toBeGreaterThan(0.01);
    expect(ss.mean(draws)).toBeCloseTo(0, 1);
    expect(ss.sampleStandardDeviation(draws)).toBeCloseTo(1, 1);
  });
});

describe("simulated plates", () => {
  let map = emptyPlateMap(384);
  map = assignWells(map, selectColumns(384, [1, 23]), { role: "neutral" });
  map = assignWells(map, selectColumns(384, [2, 24]), { role: "full" });

  it("endpoint controls land on their means with the intended spread (Z′ by Zhang et al. 1999)", () => {
    const assay = { neutralSignal: 1000, fullSignal: 100, noiseSd: 20, decimals: 2 };
    const values = simulateEndpointPlate(map, new Map(), assay, 11);
    const pick = (role: string) => map.wells.filter((w) => w.role === role).map((w) => values.get(w.well)!);
    const n = pick("neutral");
    const f = pick("full");
    expect(ss.mean(n)).toBeGreaterThan(1000 - 3 * (20 / Math.sqrt(32)));
    expect(ss.mean(n)).toBeLessThan(1000 + 3 * (20 / Math.sqrt(32)));
    const z =
      1 - (3 * (ss.sampleStandardDeviation(n) + ss.sampleStandardDeviation(f))) / Math.abs(ss.mean(n) - ss.mean(f));
    expect(expectedZPrime(assay)).toBeCloseTo(1 - (3 * 40) / 900, 12);
    expect(Math.abs(z - expectedZPrime(assay))).toBeLessThan(0.05);
  });

  it("kinetic wells start at the true initial rate (slope of the early reads)", () => {
    const m = assignWells(map, ["C5"], { role: "sample", compound: "INH-000001", concentrationUm: 1, substrateUm: 40 });
    const compounds = new Map<string, CompoundTruth>([
      ["INH-000001", { id: "INH-000001", kind: "mechanism", model: "competitive", kicUm: 1 }],
    ]);
    const timesS = Array.from({ length: 11 }, (_, k) => k * 6);
    const sim = simulateKineticPlate(
      m,
      compounds,
      {
        enzyme: { vmaxUmPerS: 0.002, kmUm: 20 },
        defaultSubstrateUm: 20,
        timesS,
        gainPerUm: 500,
        baseline: 200,
        noiseSd: 0,
        depletion: true,
        decimals: 6,
      },
      3,
    );
    const truth = sim.truth.get("C5")!;
    expect(truth.initialRatePerS).toBeCloseTo(500 * ((0.002 * 40) / (20 * 2 + 40)), 12);
    const fit = ss.linearRegression(timesS.map((t, k) => [t, sim.wells.get("C5")![k]!]));
    // Depletion bends the curve a little even over one minute: within 0.1 %.
    expect(Math.abs(fit.m / truth.initialRatePerS - 1)).toBeLessThan(1e-3);
    expect(sim.wells.get("A2")!.every((v) => v === 200)).toBe(true); // no enzyme in full-inhibition wells
    expect(sim.wells.has("C6")).toBe(false); // empty wells are not written
  });
});
