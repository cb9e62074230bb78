/**
 * SciPy as an independent oracle: seeded synthetic data sets (50 per inhibition model, 200
 * dose-response curves) are fitted by this engine and by scipy.optimize.least_squares /
 * curve_fit (testdata/scipy_oracle.py, one python3 process, same objective). Parameters must
 * agree within 0.5 %.
 */
import { describe, expect, it } from "vitest";
import { fitMechanism } from "./mechanism-fit";
import { fitLogistic4 } from "./logistic4";
import { INHIBITION_MODELS, type InhibitionModel } from "./inhibition-models";
import { runScipyOracle } from "./testdata/python-oracle";
import { generateDoseResponseCurve, generateMechanismDataset } from "./testdata/synthetic";

interface ScipyMechFit {
  vmax: number;
  km: number;
  a: number;
  b: number;
  rss: number;
}
interface ScipyL4 {
  id: string;
  bottom: number;
  top: number;
  ic50: number;
  hill: number;
  log10Ic50Se: number;
  ci: [number, number];
  rss: number;
}

const TOL = 0.005;
const rel = (x: number, ref: number) => Math.abs(x - ref) / Math.abs(ref);

const datasets = INHIBITION_MODELS.flatMap((model, m) =>
  Array.from({ length: 50 }, (_, k) => generateMechanismDataset(model, 1000 * (m + 1) + k)),
);
const curves = Array.from({ length: 200 }, (_, k) => generateDoseResponseCurve(50_000 + k));
const oracle = runScipyOracle<{
  mechanism: { id: string; fits: Record<InhibitionModel, ScipyMechFit> }[];
  logistic4: ScipyL4[];
}>({
  mechanism: { datasets },
  logistic4: { curves },
});

describe("SciPy oracle: mechanism fits vs scipy.optimize.least_squares (50 data sets per model)", () => {
  const ours = datasets.map((d) => fitMechanism(d.points));

  it.each(INHIBITION_MODELS.map((m) => [m]))("%s model on its own data: Vmax, Km, Kic, Kiu within 0.5 %%", (model) => {
    let compared = 0;
    datasets.forEach((d, k) => {
      if (d.model !== model) return;
      const mine = ours[k]!.models[model];
      const ref = oracle.mechanism[k]!.fits[model];
      expect(rel(mine.vmax, ref.vmax)).toBeLessThan(TOL);
      expect(rel(mine.km, ref.km)).toBeLessThan(TOL);
      if (model !== "uncompetitive") expect(rel(mine.kic!, 1 / ref.a)).toBeLessThan(TOL);
      if (model !== "competitive") expect(rel(mine.kiu!, 1 / ref.b)).toBeLessThan(TOL);
      expect(rel(mine.rss, ref.rss)).toBeLessThan(1e-6);
      compared++;
    });
    expect(compared).toBe(50);
  });

  it("every model on every data set: our RSS is never worse than SciPy's (200 × 4 fits)", () => {
    datasets.forEach((d, k) => {
      for (const model of INHIBITION_MODELS) {
        const mine = ours[k]!.models[model].rss;
        const ref = oracle.mechanism[k]!.fits[model].rss;
        expect(mine).toBeLessThanOrEqual(ref * (1 + 1e-6) + 1e-300);
      }
    });
  });

  it("the generating model is chosen in most data sets (sanity, not a reference)", () => {
    const correct = datasets.filter((d, k) => ours[k]!.best === d.model).length;
    expect(correct / datasets.length).toBeGreaterThan(0.8);
  });
});

describe("SciPy oracle: 4PL fits vs scipy.optimize.curve_fit (200 seeded curves)", () => {
  it("IC50, Hill, 95 % CI within 0.5 %; top and bottom within 0.5 % of the span", () => {
    curves.forEach((c, k) => {
      const mine = fitLogistic4(c.concentration, c.response);
      const ref = oracle.logistic4[k]!;
      const span = Math.abs(ref.top - ref.bottom);
      expect(rel(mine.ic50!, ref.ic50)).toBeLessThan(TOL);
      expect(rel(mine.hill!, ref.hill)).toBeLessThan(TOL);
      expect(Math.abs(mine.top! - ref.top) / span).toBeLessThan(TOL);
      expect(Math.abs(mine.bottom! - ref.bottom) / span).toBeLessThan(TOL);
      expect(rel(mine.ic50Ci95[0]!, ref.ci[0])).toBeLessThan(TOL);
      expect(rel(mine.ic50Ci95[1]!, ref.ci[1])).toBeLessThan(TOL);
      expect(rel(mine.log10Ic50Se!, ref.log10Ic50Se)).toBeLessThan(TOL);
      expect(mine.rss).toBeLessThanOrEqual(ref.rss * (1 + 1e-9));
    });
  });
});
