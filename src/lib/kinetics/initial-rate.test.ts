import { describe, expect, it } from "vitest";
import { initialRate } from "./initial-rate";
import { runScipyOracle } from "./testdata/python-oracle";
import { seededNormal, seededRandom } from "./testdata/synthetic";

// Progress curves generated here from textbook rate laws (invented parameters); the shapes and the
// "≤ 10 % conversion, linear in time" rule are common practice.
const t = Array.from({ length: 20 }, (_, k) => k * 30);
const z = seededNormal(seededRandom(7));

describe("initial rates from kinetic reads (common practice; slope checked against scipy.stats.linregress)", () => {
  const linear = t.map((x) => 0.1 + 0.002 * x + 0.002 * z());
  const falling = t.map((x) => 1.1 - 0.0015 * x + 0.002 * z());
  const noisy = t.map((x) => 0.1 + 0.0005 * x + 0.02 * z());
  const scipy = runScipyOracle<{
    linregress: { slope: number; intercept: number; rSquared: number; slopeSe: number }[];
  }>({
    linregress: {
      series: [
        [t, linear],
        [t, falling],
        [t, noisy],
      ],
    },
  }).linregress;

  it("a linear read uses every point; slope, intercept, R² and SE match linregress", () => {
    [linear, falling, noisy].forEach((y, k) => {
      const r = initialRate(t, y);
      expect(r.progress).toBe("linear");
      expect(r.curved).toBe(false);
      expect(r.nPoints).toBe(20);
      expect(r.slope).toBeCloseTo(scipy[k]!.slope, 12);
      expect(r.intercept).toBeCloseTo(scipy[k]!.intercept, 10);
      expect(r.rSquared!).toBeCloseTo(scipy[k]!.rSquared, 10);
      expect(r.slopeSe!).toBeCloseTo(scipy[k]!.slopeSe, 12);
    });
  });

  it("substrate depletion (first-order approach to completion) is flagged and the window stays early", () => {
    const y = t.map((x) => 1.5 * (1 - Math.exp(-x / 400)) + 0.001 * z());
    const r = initialRate(t, y);
    expect(r.progress).toBe("depletion");
    expect(r.curved).toBe(true);
    expect(r.endTime).toBeLessThanOrEqual(150);
    // true initial rate 1.5/400 = 0.00375; an early window is within 15 % of it
    expect(Math.abs(r.slope - 0.00375) / 0.00375).toBeLessThan(0.15);
  });

  it("a lag (hysteretic start) is flagged and the window starts after it", () => {
    const y = t.map((x) => 0.002 * (x - 100 * (1 - Math.exp(-x / 100))) + 0.0005 * z());
    const r = initialRate(t, y);
    expect(r.progress).toBe("lag");
    expect(r.windowStart).toBeGreaterThan(0);
    expect(Math.abs(r.slope - 0.002) / 0.002).toBeLessThan(0.1);
  });

  it("a burst followed by a linear phase is flagged; the rate is the linear phase's", () => {
    const y = t.map((x) => 0.3 * (1 - Math.exp(-x / 15)) + 0.001 * x + 0.0005 * z());
    const r = initialRate(t, y);
    expect(r.progress).toBe("burst");
    expect(Math.abs(r.slope - 0.001) / 0.001).toBeLessThan(0.1);
  });

  it("sorts unsorted reads and rejects repeated times and short reads", () => {
    const r = initialRate([...t].reverse(), [...linear].reverse());
    expect(r.slope).toBeCloseTo(scipy[0]!.slope, 12);
    expect(() => initialRate([0, 1, 1, 2], [0, 1, 2, 3])).toThrow(/twice/);
    expect(() => initialRate([0, 1, 2], [0, 1, 2])).toThrow(/at least 4/);
  });
});
