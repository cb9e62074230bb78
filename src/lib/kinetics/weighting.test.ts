/**
 * Weighting from the data, against outside references:
 * - digamma and trigamma against SciPy (scipy.special.digamma, polygamma(1, ·));
 * - the sampling law of ln s behind the regression (E and Var of ln s for normal samples) against a
 *   NumPy Monte Carlo of 400 000 samples per size;
 * - the weighted slope of log SD on log mean against R's lm(z ~ x, weights = w);
 * - fully iterated relative weighting (GLS) against R's nls refitted with weights 1/Ŷ² until the
 *   weights settle (minpack.lm's nlsLM), on R `datasets::Puromycin` (treated) — public data.
 * Behaviour on seeded invented data (marked so) checks the decision's error rates and why fitted
 * rather than observed values weight the residuals.
 */
import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import type { LeastSquaresProblem } from "./least-squares";
import { levenbergMarquardt } from "./least-squares";
import {
  chooseWeighting,
  digamma,
  fitRelativeWeighted,
  relativeWeightFactors,
  replicateGroups,
  scaleRows,
  trigamma,
} from "./weighting";
import { ensureScipy } from "./testdata/python-oracle";
import { readRLines, rPrint, runR, rVector } from "./testdata/r-oracle";
import { PUROMYCIN_TREATED } from "./testdata/reference-data";
import { seededNormal, seededRandom } from "./testdata/synthetic";

function python(script: string): string {
  ensureScipy();
  const out = spawnSync("python3", ["-c", script], { encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  if (out.status !== 0) throw new Error(`python3 failed (${out.status}): ${out.stderr}`);
  return out.stdout;
}

/** Michaelis–Menten v = Vm·S/(K + S) as an unweighted least-squares problem (residual y − f). */
function michaelisMentenProblem(s: readonly number[], v: readonly number[]): LeastSquaresProblem {
  return {
    nParams: 2,
    nObs: s.length,
    evaluate(theta, r, jac) {
      const vm = theta[0]!;
      const k = theta[1]!;
      for (let i = 0; i < s.length; i++) {
        const d = k + s[i]!;
        r[i] = v[i]! - (vm * s[i]!) / d;
        if (jac) {
          jac[2 * i] = s[i]! / d;
          jac[2 * i + 1] = (-vm * s[i]!) / (d * d);
        }
      }
    },
  };
}

describe("digamma and trigamma against SciPy (scipy.special)", () => {
  const xs = [0.5, 1, 1.5, 2, 3.5, 7, 12.25, 40];
  const ref = JSON.parse(
    python(
      `import json; from scipy.special import digamma, polygamma; xs=${JSON.stringify(xs)}; print(json.dumps([[float(digamma(x)), float(polygamma(1, x))] for x in xs]))`,
    ),
  ) as [number, number][];
  it.each(xs.map((x, k) => [x, k]))("x = %s: both within 1e-10 relative", (x, k) => {
    expect(Math.abs(digamma(x) / ref[k]![0] - 1)).toBeLessThan(1e-10);
    expect(Math.abs(trigamma(x) / ref[k]![1] - 1)).toBeLessThan(1e-10);
  });
});

describe("sampling law of ln s (normal samples): NumPy Monte Carlo, 400 000 samples per size", () => {
  const sizes = [2, 3, 4, 6];
  const mc = JSON.parse(
    python(`
import json, numpy as np
rng = np.random.default_rng(20240614)
out = []
for n in ${JSON.stringify(sizes)}:
    z = rng.standard_normal((400000, n))
    ls = np.log(z.std(axis=1, ddof=1))
    out.append([float(ls.mean()), float(ls.var())])
print(json.dumps(out))
`),
  ) as [number, number][];
  it.each(sizes.map((n, k) => [n, k]))("n = %i: E[ln s] = ½(ψ(ν/2) − ln(ν/2)) and Var[ln s] = ψ′(ν/2)/4", (n, k) => {
    const half = (n - 1) / 2;
    const mean = 0.5 * (digamma(half) - Math.log(half));
    const variance = trigamma(half) / 4;
    // Monte Carlo SE of the mean is ≈ √(Var/4e5) ≤ 0.002; of the variance ≈ Var·√(2/4e5)·(kurtosis) ≲ 1 %.
    expect(Math.abs(mc[k]![0] - mean)).toBeLessThan(0.006);
    expect(Math.abs(mc[k]![1] / variance - 1)).toBeLessThan(0.03);
  });
});

describe("chooseWeighting", () => {
  it("replicateGroups: mean and n − 1 SD per key, singletons left out (hand-computed)", () => {
    const g = replicateGroups(["a", "a", "b", "b", "c"], [1, 3, 10, 14, 7]);
    expect(g).toHaveLength(2);
    expect(g[0]!.mean).toBe(2);
    expect(g[0]!.sd).toBeCloseTo(Math.SQRT2, 14);
    expect(g[1]!.sd).toBeCloseTo(2 * Math.SQRT2, 14);
    expect(() => replicateGroups(["a"], [1, 2])).toThrow(/same length/);
  });

  it("SD exactly ∝ mean (invented groups): slope 1, relative", () => {
    const c = chooseWeighting([
      { mean: 10, sd: 1, n: 2 },
      { mean: 30, sd: 3, n: 2 },
      { mean: 100, sd: 10, n: 2 },
      { mean: 300, sd: 30, n: 2 },
    ]);
    expect(c.weighting).toBe("relative");
    expect(c.slope!).toBeCloseTo(1, 12);
    expect(c.reason).toMatch(/SD grows with the signal/);
  });

  it("too few groups, or means within 2-fold: none, and the reason says why", () => {
    const few = chooseWeighting([
      { mean: 10, sd: 1, n: 3 },
      { mean: 100, sd: 10, n: 3 },
    ]);
    expect(few.weighting).toBe("none");
    expect(few.reason).toMatch(/at least 3/);
    const narrow = chooseWeighting([
      { mean: 10, sd: 1, n: 3 },
      { mean: 12, sd: 1.2, n: 3 },
      { mean: 15, sd: 1.5, n: 3 },
    ]);
    expect(narrow.weighting).toBe("none");
    expect(narrow.reason).toMatch(/2-fold/);
  });

  it("the weighted slope and its SE agree with R's lm(z ~ x, weights = w) to 1e-10", () => {
    const groups = [
      { mean: 0.8, sd: 0.07, n: 2 },
      { mean: 2, sd: 0.15, n: 3 },
      { mean: 6, sd: 0.9, n: 2 },
      { mean: 20, sd: 1.4, n: 4 },
      { mean: 55, sd: 6.5, n: 3 },
    ];
    const c = chooseWeighting(groups);
    const x = groups.map((g) => Math.log(g.mean));
    const z = groups.map((g) => Math.log(g.sd) - 0.5 * (digamma((g.n - 1) / 2) - Math.log((g.n - 1) / 2)));
    const w = groups.map((g) => 4 / trigamma((g.n - 1) / 2));
    const r = readRLines(
      runR(`
x <- ${rVector(x)}; z <- ${rVector(z)}; w <- ${rVector(w)}
m <- lm(z ~ x, weights = w)
phi <- sum(w * residuals(m)^2) / df.residual(m)
${rPrint("slope", "coef(m)[2]")}${rPrint("seKnown", "summary(m)$coefficients[2, 2] / summary(m)$sigma")}${rPrint("phi", "phi")}
`),
    );
    expect(Math.abs(c.slope! / r.slope![0]! - 1)).toBeLessThan(1e-10);
    // Known-variance SE, inflated by √φ only when the groups scatter more than their sampling law allows.
    const se = r.seKnown![0]! * Math.sqrt(Math.max(1, r.phi![0]!));
    expect(Math.abs(c.slopeSe! / se - 1)).toBeLessThan(1e-10);
  });

  // Invented data: duplicates at 8 doses of a falling curve 1000 → 50, constant SD 30 or CV 10 %.
  const means = [1000, 980, 930, 800, 560, 300, 130, 70];
  function simulate(seed: number, proportional: boolean) {
    const z = seededNormal(seededRandom(seed));
    const keys: string[] = [];
    const y: number[] = [];
    means.forEach((m, k) => {
      for (let rep = 0; rep < 2; rep++) {
        keys.push(String(k));
        y.push(proportional ? m * (1 + 0.1 * z()) : m + 30 * z());
      }
    });
    return chooseWeighting(keys, y);
  }

  it("seeded invented data, 400 sets each: constant SD → relative in ≤ 8 %, CV 10 % → relative in ≥ 60 %", () => {
    let falseRelative = 0;
    let trueRelative = 0;
    for (let s = 0; s < 400; s++) {
      if (simulate(9000 + s, false).weighting === "relative") falseRelative++;
      if (simulate(19000 + s, true).weighting === "relative") trueRelative++;
    }
    // The test is one-sided at 5 %; with duplicates ln s is very noisy (SD 1.1), which limits power.
    expect(falseRelative / 400).toBeLessThan(0.08);
    expect(trueRelative / 400).toBeGreaterThan(0.6);
  });
});

describe("relative weighting by iterated GLS", () => {
  const s = PUROMYCIN_TREATED.conc;
  const v = PUROMYCIN_TREATED.rate;

  it("Puromycin (treated): Vm and K within 1e-6 of R's nlsLM (minpack.lm) refitted with weights 1/Ŷ² until they settle", () => {
    const problem = michaelisMentenProblem(s, v);
    const gls = fitRelativeWeighted(problem, v, [200, 0.1], { tol: 1e-12 });
    expect(gls.converged).toBe(true);
    const r = readRLines(
      runR(`
library(minpack.lm)
d <- data.frame(conc = ${rVector(s)}, rate = ${rVector(v)})
ctl <- nls.lm.control(ftol = 1e-14, ptol = 1e-14, maxiter = 500)
fit <- nlsLM(rate ~ Vm * conc / (K + conc), data = d, start = list(Vm = 200, K = 0.1), control = ctl)
for (i in 1:100) {
  f <- fitted(fit)
  d$w <- 1 / pmax(abs(f), 0.05 * max(abs(f)))^2
  fit <- nlsLM(rate ~ Vm * conc / (K + conc), data = d, start = coef(fit), weights = w, control = ctl)
}
${rPrint("coef", "coef(fit)")}${rPrint("rss", "deviance(fit)")}
`),
    );
    expect(Math.abs(gls.result.theta[0]! / r.coef![0]! - 1)).toBeLessThan(1e-6);
    expect(Math.abs(gls.result.theta[1]! / r.coef![1]! - 1)).toBeLessThan(1e-6);
    expect(Math.abs(gls.result.rss / r.rss![0]! - 1)).toBeLessThan(1e-5);
  });

  it("relativeWeightFactors floors |Ŷ| at 5 % of the largest; scaleRows multiplies residual and Jacobian rows", () => {
    expect(Array.from(relativeWeightFactors([100, 10, 1, 0, -50]))).toEqual([0.01, 0.1, 0.2, 0.2, 0.02]);
    expect(Array.from(relativeWeightFactors([0, 0]))).toEqual([1, 1]);
    const p = michaelisMentenProblem([1, 2], [3, 4]);
    const scaled = scaleRows(p, [2, 0]);
    const r = new Float64Array(2);
    const j = new Float64Array(4);
    const r0 = new Float64Array(2);
    const j0 = new Float64Array(4);
    p.evaluate(Float64Array.of(5, 1), r0, j0);
    scaled.evaluate(Float64Array.of(5, 1), r, j);
    // (+ 0 turns the −0 of a zeroed negative entry into 0 for the comparison.)
    expect(Array.from(r, (x) => x + 0)).toEqual([2 * r0[0]!, 0]);
    expect(Array.from(j, (x) => x + 0)).toEqual([2 * j0[0]!, 2 * j0[1]!, 0, 0]);
  });

  it("seeded invented data (CV 10 %, 300 sets): fitted-value weights recover Vm within 0.5 % on average; observed-value weights are biased low", () => {
    const sTrue = [0.02, 0.02, 0.06, 0.06, 0.11, 0.11, 0.22, 0.22, 0.56, 0.56, 1.1, 1.1];
    const vm = 200;
    const k = 0.06;
    let glsSum = 0;
    let observedSum = 0;
    const sets = 300;
    for (let seed = 0; seed < sets; seed++) {
      const z = seededNormal(seededRandom(31_000 + seed));
      const y = sTrue.map((c) => ((vm * c) / (k + c)) * (1 + 0.1 * z()));
      const problem = michaelisMentenProblem(sTrue, y);
      glsSum += fitRelativeWeighted(problem, y, [vm, k]).result.theta[0]!;
      const byObserved = levenbergMarquardt(
        scaleRows(
          problem,
          y.map((v) => 1 / v),
        ),
        [vm, k],
      );
      observedSum += byObserved.theta[0]!;
    }
    const glsBias = glsSum / sets / vm - 1;
    const observedBias = observedSum / sets / vm - 1;
    expect(Math.abs(glsBias)).toBeLessThan(0.005);
    expect(observedBias).toBeLessThan(-0.01);
  });
});
