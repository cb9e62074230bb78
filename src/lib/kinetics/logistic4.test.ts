import { describe, expect, it } from "vitest";
import { fitLogistic4, logistic4 } from "./logistic4";
import { extraSumOfSquaresFTest } from "./model-selection";
import { DNASE_RUN1 } from "./testdata/reference-data";
import { readRLines, rPrint, runR, rVector } from "./testdata/r-oracle";
import { seededNormal, seededRandom } from "./testdata/synthetic";

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

describe("4PL relative weighting (residual / fitted value, iterated to a fixed point)", () => {
  const x = DNASE_RUN1.conc;
  const y = DNASE_RUN1.density;

  it("unweighted results are unchanged: weighting 'none' gives the same JSON as no option, with no weighting field", () => {
    const plain = fitLogistic4(x, y);
    expect(JSON.stringify(fitLogistic4(x, y, { weighting: "none" }))).toBe(JSON.stringify(plain));
    expect("weighting" in plain).toBe(false);
  });

  it("DNase run 1: parameters within 1e-5 of R's nlsLM (minpack.lm) refitted with weights 1/max(Ŷ, 5 % of max Ŷ)² until they settle", () => {
    const w = fitLogistic4(x, y, { weighting: "relative" });
    expect(w.weighting).toBe("relative");
    expect(w.converged).toBe(true);
    const r = readRLines(
      runR(`
library(minpack.lm)
d <- data.frame(x = ${rVector(x)}, y = ${rVector(y)})
f4 <- y ~ b + (t - b) / (1 + 10^(h * (log10(x) - l)))
ctl <- nls.lm.control(ftol = 1e-14, ptol = 1e-14, maxiter = 1000)
fit <- nlsLM(f4, data = d, start = list(b = 0, t = 2.4, l = log10(4.5), h = -0.94), control = ctl)
for (i in 1:200) {
  f <- fitted(fit)
  d$w <- 1 / pmax(abs(f), 0.05 * max(abs(f)))^2
  fit <- nlsLM(f4, data = d, start = coef(fit), weights = w, control = ctl)
}
s <- summary(fit)
${rPrint("coef", "coef(fit)")}${rPrint("se", "s$coefficients[, 2]")}${rPrint("rss", "deviance(fit)")}
`),
    );
    const [b, t, l, h] = r.coef!;
    // R's parameterisation keeps its orientation (rising: h < 0); ours reports Top ≥ Bottom, |h|.
    expect(Math.abs(w.bottom! - b!) / (t! - b!)).toBeLessThan(1e-5);
    expect(Math.abs(w.top! / t! - 1)).toBeLessThan(1e-5);
    expect(Math.abs(w.log10Ic50! - l!)).toBeLessThan(1e-5);
    expect(Math.abs(w.hill! / Math.abs(h!) - 1)).toBeLessThan(1e-5);
    expect(Math.abs(w.rss / r.rss![0]! - 1)).toBeLessThan(1e-5);
    expect(Math.abs(w.log10Ic50Se! / r.se![2]! - 1)).toBeLessThan(1e-3);
    expect(w.direction).toBe("rising");
  });

  it("seeded invented curves 1000 → 20 with CV 10 % noise (400 sets): relative weighting finds the low plateau 4× better", () => {
    // Under proportional noise the low plateau is measured precisely (SD ≈ 2) but an unweighted fit
    // lets the noisy top (SD ≈ 100) move it; the potency itself gains little (its information is
    // in the middle of the curve).
    const conc = Array.from({ length: 10 }, (_, k) => 30 / Math.pow(10, k / 2));
    let sqPlain = 0;
    let sqRelative = 0;
    let lPlain = 0;
    let lRelative = 0;
    for (let seed = 0; seed < 400; seed++) {
      const z = seededNormal(seededRandom(44_000 + seed));
      const yy = conc.map((c) => logistic4(c, 1000, 20, Math.log10(0.5), 1) * (1 + 0.1 * z()));
      const plain = fitLogistic4(conc, yy);
      const relative = fitLogistic4(conc, yy, { weighting: "relative" });
      sqPlain += (plain.bottom! - 20) ** 2;
      sqRelative += (relative.bottom! - 20) ** 2;
      lPlain += (plain.log10Ic50! - Math.log10(0.5)) ** 2;
      lRelative += (relative.log10Ic50! - Math.log10(0.5)) ** 2;
    }
    expect(Math.sqrt(sqRelative / sqPlain)).toBeLessThan(0.25);
    expect(lRelative).toBeLessThan(lPlain);
  });

  it("rejects an unknown weighting and a floor outside (0, 1]", () => {
    expect(() => fitLogistic4(x, y, { weighting: "bogus" as "none" })).toThrow(
      /weighting must be "none" or "relative"/,
    );
    expect(() => fitLogistic4(x, y, { weighting: "relative", weightFloor: 0 })).toThrow(
      /weightFloor must be in \(0, 1\]/,
    );
  });
});
