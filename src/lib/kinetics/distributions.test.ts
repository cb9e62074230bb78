import { describe, expect, it } from "vitest";
import {
  fCdf,
  fSurvival,
  regularizedIncompleteBeta,
  studentTCdf,
  studentTQuantile,
  tCritical95,
} from "./distributions";
import { runScipyOracle } from "./testdata/python-oracle";

const dfs = [1, 2, 3, 4, 5, 6, 8, 10, 12, 20, 32, 50, 100, 1000, 100000];
const ps = [1e-6, 0.001, 0.025, 0.1, 0.4, 0.6, 0.9, 0.975, 0.995, 0.999999];

describe("distribution functions against SciPy (scipy.stats / scipy.special, run in this test)", () => {
  const request = {
    tppf: dfs.flatMap((df) => ps.map((p) => [p, df])),
    tcdf: dfs.flatMap((df) => [-40, -3, -0.5, 0, 0.7, 2.2, 9].map((t) => [t, df])),
    fsf: [
      [0.2098, 1, 12],
      [2.93, 1, 32],
      [100, 1, 30],
      [0.5, 3, 7],
      [4, 2, 2],
      [1.5, 10, 100],
      [1e-4, 1, 5],
      [30, 5, 5],
    ],
    betainc: [
      [0.5, 2, 3],
      [0.01, 0.5, 0.5],
      [0.99, 0.5, 10],
      [0.3, 50, 60],
      [0.45, 200, 250],
      [0.9, 1, 1],
      [1e-5, 3, 0.5],
    ],
  };
  const scipy = runScipyOracle<{ distributions: { tppf: number[]; tcdf: number[]; fsf: number[]; betainc: number[] } }>(
    { distributions: request },
  ).distributions;

  it("Student t quantile matches scipy.stats.t.ppf to 1e-9 relative", () => {
    request.tppf.forEach(([p, df], k) => {
      const ref = scipy.tppf[k]!;
      expect(Math.abs(studentTQuantile(p!, df!) - ref)).toBeLessThanOrEqual(1e-9 * Math.abs(ref) + 1e-12);
    });
  });

  it("Student t CDF matches scipy.stats.t.cdf to 1e-10 absolute", () => {
    request.tcdf.forEach(([t, df], k) => {
      expect(Math.abs(studentTCdf(t!, df!) - scipy.tcdf[k]!)).toBeLessThanOrEqual(1e-10);
    });
  });

  it("F upper tail matches scipy.stats.f.sf to 1e-9 relative", () => {
    request.fsf.forEach(([f, d1, d2], k) => {
      const ref = scipy.fsf[k]!;
      expect(Math.abs(fSurvival(f!, d1!, d2!) - ref)).toBeLessThanOrEqual(1e-9 * ref + 1e-15);
      expect(fCdf(f!, d1!, d2!)).toBeCloseTo(1 - ref, 12);
    });
  });

  it("regularized incomplete beta matches scipy.special.betainc to 1e-10", () => {
    request.betainc.forEach(([x, a, b], k) => {
      expect(Math.abs(regularizedIncompleteBeta(x!, a!, b!) - scipy.betainc[k]!)).toBeLessThanOrEqual(1e-10);
    });
  });

  it("t(0.975, 12) = 2.178813 (printed t tables, e.g. Abramowitz & Stegun table 26.10) and is cached", () => {
    expect(tCritical95(12)).toBeCloseTo(2.178813, 6);
    expect(tCritical95(12)).toBe(tCritical95(12));
    expect(studentTQuantile(0.5, 7)).toBe(0);
  });
});
