/**
 * Seeded, deterministic generators of synthetic data for the SciPy oracle tests and the
 * benchmark. Synthetic (invented) data: not a reference by itself — the reference is SciPy's
 * fit of the same numbers. No I/O.
 */
import { mixedRateReciprocal, type InhibitionModel } from "../inhibition-models";
import type { MechanismPoint } from "../mechanism-fit";

import { seededUniform as seededRandom } from "../../random";

export { seededRandom };

/** Standard normal deviates by Box–Muller from a uniform source. */
export function seededNormal(uniform: () => number): () => number {
  return () => {
    const u = 1 - uniform();
    const v = uniform();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
}

export interface MechanismDataset {
  id: string;
  model: InhibitionModel;
  truth: { vmax: number; km: number; a: number; b: number };
  points: MechanismPoint[];
}

/**
 * A substrate × inhibitor matrix from `model`: S = Km × {0.2, 0.5, 1, 2, 5, 10},
 * I = Ki × {0, 0.5, 1, 2, 4}, duplicates, additive normal noise with SD 2 % of Vmax.
 */
export function generateMechanismDataset(model: InhibitionModel, seed: number): MechanismDataset {
  const u = seededRandom(seed);
  const z = seededNormal(u);
  const vmax = Math.pow(10, -1 + 2 * u());
  const km = Math.pow(10, 3 * u() - 1);
  const ki = Math.pow(10, 3 * u() - 1.5);
  // Mixed: α = Kiu/Kic between 0.2 and 5, at least 2-fold away from 1.
  const alpha = Math.pow(10, (0.3 + 0.4 * u()) * (u() < 0.5 ? -1 : 1));
  let a = 1 / ki;
  let b = 1 / ki;
  if (model === "competitive") b = 0;
  else if (model === "uncompetitive") a = 0;
  else if (model === "mixed") b = 1 / (alpha * ki);
  const points: MechanismPoint[] = [];
  for (const im of [0, 0.5, 1, 2, 4]) {
    for (const sm of [0.2, 0.5, 1, 2, 5, 10]) {
      for (let rep = 0; rep < 2; rep++) {
        const s = sm * km;
        const i = im * ki;
        points.push({
          substrate: s,
          inhibitor: i,
          rate: mixedRateReciprocal(s, i, vmax, km, a, b) + 0.02 * vmax * z(),
        });
      }
    }
  }
  return { id: `${model}-${seed}`, model, truth: { vmax, km, a, b }, points };
}

export interface DoseResponseCurve {
  id: string;
  truth: { top: number; bottom: number; log10Ic50: number; hill: number };
  concentration: number[];
  response: number[];
}

/**
 * A ten-point, half-log dilution series from 30 µM-equivalent down, 4PL with IC50 inside the
 * range, |h| in 0.7–1.6, top ≈ 100, bottom ≈ 0, normal noise SD 3; about a third rise.
 */
export function generateDoseResponseCurve(seed: number, points = 10): DoseResponseCurve {
  const u = seededRandom(seed);
  const z = seededNormal(u);
  const top = 100 + 6 * (u() - 0.5);
  const bottom = 6 * (u() - 0.5);
  const log10Ic50 = -1.5 + 2.5 * u();
  const rising = u() < 1 / 3;
  const hill = (0.7 + 0.9 * u()) * (rising ? -1 : 1);
  const concentration: number[] = [];
  const response: number[] = [];
  for (let k = 0; k < points; k++) {
    const x = 30 * Math.pow(10, -k / 2);
    concentration.push(Number(x.toPrecision(6)));
    const y = bottom + (top - bottom) / (1 + Math.pow(10, hill * (Math.log10(x) - log10Ic50)));
    response.push(Number((y + 3 * z()).toFixed(4)));
  }
  return { id: `cpd-${seed}`, truth: { top, bottom, log10Ic50, hill }, concentration, response };
}
