/**
 * Adequacy checks against outside references:
 * - runs test: the exact run-count distribution by exhaustive enumeration of every arrangement of
 *   the signs (Python's itertools, one python3 process), hand-counted small cases, and the normal
 *   approximation for n > 60 against Python's exact big-integer distribution;
 * - lack-of-fit F-test: R's own computations on public data sets with replicates — R `datasets`
 *   `cars` (straight line, anova(lm(dist ~ speed), lm(dist ~ factor(speed)))) and `DNase` run 1
 *   (4PL by nls/SSfpl against the pure-error lm(density ~ factor(conc))). F and p within 1 %.
 */
import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { assessAdequacy, lackOfFitTest, runsTest } from "./adequacy";
import { fitLogistic4, logistic4Fitted } from "./logistic4";
import { readRLines, rPrint, runR } from "./testdata/r-oracle";

function python(script: string): string {
  const out = spawnSync("python3", ["-c", script], { encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  if (out.status !== 0) throw new Error(`python3 failed (${out.status}): ${out.stderr}`);
  return out.stdout;
}

/** A sign sequence with n1 pluses and n2 minuses in exactly `runs` runs. */
function withRuns(n1: number, n2: number, runs: number): number[] {
  // Runs alternate; the first sign has ⌈runs/2⌉ runs, the other ⌊runs/2⌋. Start with + when the
  // counts allow it, else with −. All runs but the last of each sign have length 1.
  const startPlus = Math.ceil(runs / 2) <= n1 && Math.floor(runs / 2) <= n2;
  const [first, second] = startPlus ? [n1, n2] : [n2, n1];
  const firstRuns = Math.ceil(runs / 2);
  const secondRuns = Math.floor(runs / 2);
  const lengths = (total: number, count: number) =>
    Array.from({ length: count }, (_, k) => (k < count - 1 ? 1 : total - (count - 1)));
  const a = lengths(first, firstRuns);
  const b = lengths(second, secondRuns);
  const seq: number[] = [];
  for (let r = 0; r < runs; r++) {
    const isFirst = r % 2 === 0;
    const len = isFirst ? a[r / 2]! : b[(r - 1) / 2]!;
    const sign = isFirst === startPlus ? 1 : -1;
    for (let k = 0; k < len; k++) seq.push(sign);
  }
  return seq;
}

describe("runs test: exact distribution by exhaustive enumeration (Python itertools)", () => {
  const cases: [number, number][] = [
    [2, 2],
    [3, 3],
    [4, 5],
    [6, 6],
    [5, 8],
    [7, 7],
    [9, 9],
  ];
  // For each (n1, n2): P(R ≤ r) for every attainable r, counted over all C(n, n1) arrangements.
  const enumerated = JSON.parse(
    python(`
import itertools, json
out = {}
for n1, n2 in ${JSON.stringify(cases)}:
    n = n1 + n2
    counts = {}
    total = 0
    for plus in itertools.combinations(range(n), n1):
        s = [-1] * n
        for k in plus: s[k] = 1
        r = 1 + sum(1 for k in range(1, n) if s[k] != s[k - 1])
        counts[r] = counts.get(r, 0) + 1
        total += 1
    cdf = {}
    acc = 0
    for r in sorted(counts):
        acc += counts[r]
        cdf[r] = acc / total
    out[f"{n1},{n2}"] = cdf
print(json.dumps(out))
`),
  ) as Record<string, Record<string, number>>;

  it.each(cases)("n₊ = %i, n₋ = %i: P(R ≤ r) for every attainable r within 1e-12", (n1, n2) => {
    const cdf = enumerated[`${n1},${n2}`]!;
    let checked = 0;
    for (const [r, p] of Object.entries(cdf)) {
      const seq = withRuns(n1, n2, Number(r));
      expect(seq.filter((v) => v > 0).length).toBe(n1);
      expect(seq.length).toBe(n1 + n2);
      const t = runsTest(seq);
      expect(t.runs).toBe(Number(r));
      expect(t.expected).toBeCloseTo(1 + (2 * n1 * n2) / (n1 + n2), 12);
      expect(Math.abs(t.p - p)).toBeLessThan(1e-12);
      checked++;
    }
    expect(checked).toBeGreaterThan(1);
  });

  it("hand count: + + − − has 2 runs; of the 6 orders of two + and two −, 2 have 2 runs → p = 1/3", () => {
    expect(runsTest([1, 1, -1, -1]).p).toBeCloseTo(1 / 3, 14);
    // + − + − : 4 runs, every order has ≤ 4 runs.
    expect(runsTest([1, -1, 1, -1]).p).toBeCloseTo(1, 14);
  });

  it("the documented example + + + − − − + + + − − −: 4 runs, expected 7, p = 62/924 = 0.0671", () => {
    const t = runsTest([1, 1, 1, -1, -1, -1, 1, 1, 1, -1, -1, -1]);
    expect(t.runs).toBe(4);
    expect(t.expected).toBe(7);
    // Enumeration: arrangements of 6 + and 6 − with ≤ 4 runs: 2 + 2·C(5,1)² + ... = 62 of 924.
    expect(t.p).toBeCloseTo(Number(enumerated["6,6"]!["4"]), 14);
    expect(t.p).toBeCloseTo(62 / 924, 14);
  });

  it("zero residuals are left out; fewer than two of a sign gives p = 1", () => {
    expect(runsTest([1, 0, 1, 0, -1, -1]).runs).toBe(2);
    expect(runsTest([1, 1, 1, -1]).p).toBe(1);
  });
});

describe("runs test: normal approximation above n = 60 (Python exact big-integer distribution)", () => {
  // Exact P(R ≤ r) from the closed form (even r = 2k: 2·C(n1−1,k−1)·C(n2−1,k−1); odd r = 2k+1:
  // C(n1−1,k)·C(n2−1,k−1) + C(n1−1,k−1)·C(n2−1,k)) over C(n, n1), in exact integers.
  const cases: [number, number, number][] = [
    [40, 40, 30],
    [40, 40, 41],
    [35, 45, 34],
    [50, 30, 30],
  ];
  const exact = JSON.parse(
    python(`
import json
from math import comb
from fractions import Fraction
out = []
for n1, n2, r in ${JSON.stringify(cases)}:
    tot = comb(n1 + n2, n1)
    acc = 0
    for x in range(2, r + 1):
        if x % 2 == 0:
            k = x // 2
            acc += 2 * comb(n1 - 1, k - 1) * comb(n2 - 1, k - 1)
        else:
            k = (x - 1) // 2
            acc += comb(n1 - 1, k) * comb(n2 - 1, k - 1) + comb(n1 - 1, k - 1) * comb(n2 - 1, k)
    out.append(float(Fraction(acc, tot)))
print(json.dumps(out))
`),
  ) as number[];

  it.each(cases.map((c, k) => [...c, k] as const))(
    "n₊ %i, n₋ %i, %i runs: continuity-corrected normal p within 0.01 of the exact p",
    (n1, n2, r, k) => {
      const t = runsTest(withRuns(n1, n2, r));
      expect(t.runs).toBe(r);
      const n = n1 + n2;
      const e = 1 + (2 * n1 * n2) / n;
      const v = (2 * n1 * n2 * (2 * n1 * n2 - n)) / (n * n * (n - 1));
      // The approximation itself (Wald & Wolfowitz 1940): Φ((r + ½ − E)/√V), A&S erf to 1.5e-7.
      const z = (r + 0.5 - e) / Math.sqrt(v);
      const phi = Number(python(`from math import erf, sqrt; print(0.5 * (1 + erf(${z} / sqrt(2))))`));
      expect(Math.abs(t.p - phi)).toBeLessThan(1e-6);
      expect(Math.abs(t.p - exact[k]!)).toBeLessThan(0.01);
    },
  );
});

describe("lack-of-fit F-test against R (public data sets with replicates, R datasets)", () => {
  const r = readRLines(
    runR(
      `
straight <- lm(dist ~ speed, data = cars)
groups <- lm(dist ~ factor(speed), data = cars)
a <- anova(straight, groups)
${rPrint("carsSpeed", "cars$speed")}${rPrint("carsDist", "cars$dist")}${rPrint("carsF", "a$F[2]")}${rPrint("carsP", "a[2, 'Pr(>F)']")}${rPrint("carsDf", "c(a$Df[2], a$Res.Df[2])")}
d <- DNase[DNase$Run == 1, ]
fpl <- nls(density ~ SSfpl(log(conc), A, B, xmid, scal), data = d)
pe <- lm(density ~ factor(conc), data = d)
dfPe <- df.residual(pe)
dfLof <- df.residual(fpl) - dfPe
f <- ((deviance(fpl) - deviance(pe)) / dfLof) / (deviance(pe) / dfPe)
${rPrint("dnConc", "d$conc")}${rPrint("dnDensity", "d$density")}${rPrint("dnF", "f")}${rPrint("dnP", "pf(f, dfLof, dfPe, lower.tail = FALSE)")}${rPrint("dnDf", "c(dfLof, dfPe)")}${rPrint("dnRss", "deviance(fpl)")}
`,
    ),
  );

  it("cars (dist ~ speed): F and p within 1 % of R's anova(lm(dist ~ speed), lm(dist ~ factor(speed)))", () => {
    const x = r.carsSpeed!;
    const y = r.carsDist!;
    const n = x.length;
    expect(n).toBe(50);
    const mx = x.reduce((a, b) => a + b, 0) / n;
    const my = y.reduce((a, b) => a + b, 0) / n;
    let sxy = 0;
    let sxx = 0;
    for (let i = 0; i < n; i++) {
      sxy += (x[i]! - mx) * (y[i]! - my);
      sxx += (x[i]! - mx) ** 2;
    }
    const b = sxy / sxx;
    const a = my - b * mx;
    const residual = y.map((v, i) => v - (a + b * x[i]!));
    const lof = lackOfFitTest(
      x.map((v) => String(v)),
      y,
      residual,
      2,
    )!;
    expect(lof.dfLof).toBe(r.carsDf![0]);
    expect(lof.dfPe).toBe(r.carsDf![1]);
    expect(Math.abs(lof.f / r.carsF![0]! - 1)).toBeLessThan(0.01);
    expect(Math.abs(lof.p / r.carsP![0]! - 1)).toBeLessThan(0.01);
  });

  it("DNase run 1 (4PL): F and p within 1 % of R's nls(SSfpl) RSS against lm(density ~ factor(conc))", () => {
    const x = r.dnConc!;
    const y = r.dnDensity!;
    const fit = fitLogistic4(x, y);
    expect(Math.abs(fit.rss / r.dnRss![0]! - 1)).toBeLessThan(1e-6);
    const residual = y.map((v, i) => v - logistic4Fitted(fit, x[i]!)!);
    const keys = x.map((v) => String(v));
    const lof = lackOfFitTest(keys, y, residual, 4)!;
    expect([lof.dfLof, lof.dfPe]).toEqual(r.dnDf);
    expect(Math.abs(lof.f / r.dnF![0]! - 1)).toBeLessThan(0.01);
    expect(Math.abs(lof.p / r.dnP![0]! - 1)).toBeLessThan(0.01);
    // The duplicates of run 1 agree far more closely than the 4PL follows the doses (R: F ≈ 8.8 on
    // 4 and 8 df, p ≈ 0.005), so assessAdequacy reports a lack of fit at α = 0.01; the runs test
    // (9 runs where 8.9 are expected) finds no pattern.
    expect(r.dnP![0]!).toBeLessThan(0.01);
    const both = assessAdequacy(keys, y, residual, 4);
    expect(both.lackOfFit!.f).toBe(lof.f);
    expect(both.runs.runs).toBe(9);
    expect(both.runs.p).toBeGreaterThan(0.5);
    expect(both.adequate).toBe(false);
    expect(both.reasons[0]).toMatch(/^lack of fit/);
  });

  it("no replicates, or no more conditions than parameters: null", () => {
    expect(lackOfFitTest(["a", "b", "c"], [1, 2, 3], [0.1, -0.1, 0], 2)).toBeNull();
    expect(lackOfFitTest(["a", "a", "b", "b"], [1, 1.2, 2, 2.1], [0.1, -0.1, 0.05, -0.05], 2)).toBeNull();
  });
});
