import { describe, expect, it } from "vitest";
import { fitLogistic4, logistic4 } from "./logistic4";
import { extraSumOfSquaresFTest } from "./model-selection";
import { DNASE_RUN1 } from "./testdata/reference-data";

describe("4PL: R datasets::DNase run 1 (data: R datasets; fit values computed with SciPy 1.17, same as R SSfpl)", () => {
  const fit = fitLogistic4(DNASE_RUN1.conc, DNASE_RUN1.density);

  it("bottom −0.0078971, top 2.37724, EC50 4.5150, Hill 0.94111, RSS 0.0047073", () => {
    expect(fit.bottom!).toBeCloseTo(-0.0078971, 6);
    expect(fit.top!).toBeCloseTo(2.37724, 5);
    expect(fit.ic50!).toBeCloseTo(4.515, 3);
    expect(fit.hill!).toBeCloseTo(0.94111, 5);
    expect(fit.rss).toBeCloseTo(0.0047073, 7);
    expect(fit.direction).toBe("rising");
    expect(fit.converged).toBe(true);
  });

  it("95 % CI of EC50 3.6146–5.6396 (t-based on log10 EC50, back-transformed)", () => {
    expect(fit.ic50Ci95[0]!).toBeCloseTo(3.6146, 3);
    expect(fit.ic50Ci95[1]!).toBeCloseTo(5.6396, 3);
    expect(fit.dof).toBe(12);
    expect(fit.flags).not.toContain("ci-wider-than-10-fold");
  });

  it("does not depend on the units (concentration ×1e-9, response ×1e5)", () => {
    const f = fitLogistic4(
      DNASE_RUN1.conc.map((x) => x * 1e-9),
      DNASE_RUN1.density.map((y) => y * 1e5),
    );
    expect(f.ic50! / 1e-9).toBeCloseTo(4.515, 3);
    expect(f.hill!).toBeCloseTo(0.94111, 5);
    expect(f.top! / 1e5).toBeCloseTo(2.37724, 5);
  });

  it("F-test 3-parameter (bottom fixed at 0) vs 4-parameter: F 0.2098, p 0.6551", () => {
    const three = fitLogistic4(DNASE_RUN1.conc, DNASE_RUN1.density, { fixedBottom: 0 });
    expect(three.nParams).toBe(3);
    const f = extraSumOfSquaresFTest(three.rss, 13, fit.rss, 12);
    expect(f.f).toBeCloseTo(0.2098, 4);
    expect(f.p).toBeCloseTo(0.6551, 4);
  });
});

describe("4PL behaviour (common practice)", () => {
  const conc = [30, 10, 3, 1, 0.3, 0.1, 0.03, 0.01, 0.003, 0.001];
  const exact = (h: number, ic50: number) => conc.map((x) => logistic4(x, 100, 0, Math.log10(ic50), h));

  it("recovers exact falling and rising curves without hand-tuned starting values", () => {
    for (const [h, ic50] of [
      [1, 0.2],
      [2.5, 3],
      [0.6, 0.01],
      [-1, 0.5],
      [-1.8, 5],
    ] as const) {
      const f = fitLogistic4(conc, exact(h, ic50));
      expect(f.ic50!).toBeCloseTo(ic50, 8);
      expect(f.hill!).toBeCloseTo(Math.abs(h), 8);
      expect(f.top!).toBeCloseTo(100, 6);
      expect(f.bottom!).toBeCloseTo(0, 6);
      expect(f.direction).toBe(h > 0 ? "falling" : "rising");
    }
  });

  it("fixed top and bottom keep the curve's direction and count fewer parameters", () => {
    const f = fitLogistic4(conc, exact(-1.2, 0.4), { fixedTop: 100, fixedBottom: 0 });
    expect(f.nParams).toBe(2);
    expect(f.ic50!).toBeCloseTo(0.4, 8);
    expect(f.hill!).toBeCloseTo(1.2, 8);
    expect(f.direction).toBe("rising");
    expect(f.topSe).toBeNull();
  });

  it("flags IC50 above the tested range, plateau not reached, steep Hill, wide CI", () => {
    const y = conc.map((x, k) => logistic4(x, 100, 0, Math.log10(300), 1) + (k % 2 ? 1 : -1));
    const f = fitLogistic4(conc, y);
    expect(f.flags).toContain("ic50-above-range");
    expect(f.flags).toContain("plateau-not-reached");
    const steep = fitLogistic4(
      conc,
      exact(3, 0.5).map((v, k) => v + (k % 2 ? 0.5 : -0.5)),
    );
    expect(steep.flags).toContain("hill-outside-0.5-2");
  });

  it("flags too few points and poor fits; accepts concentration 0", () => {
    const few = fitLogistic4([10, 1, 0.1, 0.01, 0.001], [2, 10, 50, 90, 99]);
    expect(few.flags).toContain("too-few-points");
    const noise = fitLogistic4(conc, [50, 10, 80, 30, 60, 20, 70, 40, 55, 45]);
    expect(noise.flags).toContain("poor-fit");
    const withZero = fitLogistic4([0, ...conc], [100, ...exact(1, 0.2)]);
    expect(withZero.ic50!).toBeCloseTo(0.2, 8);
  });

  it("never reports NaN and is deterministic", () => {
    const flat = fitLogistic4(
      conc,
      conc.map(() => 5),
    );
    expect(JSON.stringify(flat)).not.toMatch(/NaN/);
    const a = fitLogistic4(
      conc,
      exact(1.1, 0.3).map((v, k) => v + Math.sin(k)),
    );
    const b = fitLogistic4(
      conc,
      exact(1.1, 0.3).map((v, k) => v + Math.sin(k)),
    );
    expect(JSON.stringify(a)).toBe(JSON.stringify(b));
  });

  it("rejects negative concentrations and too few points with clear messages", () => {
    expect(() => fitLogistic4([1, -1, 2, 3, 4], [1, 2, 3, 4, 5])).toThrow(/≥ 0/);
    expect(() => fitLogistic4([1, 2, 3, 4], [1, 2, 3, 4])).toThrow(/at least 5/);
  });
});
