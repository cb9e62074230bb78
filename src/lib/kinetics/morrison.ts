/**
 * Tight-binding inhibition: the Morrison equation (Morrison, Biochim Biophys Acta 1969;185:269
 * [from memory]) and IC50 = K′ + E/2 (Copeland, Lombardo, Giannaras & Decicco, Bioorg Med Chem
 * Lett 1995;5:1947).
 *
 *   v/v0 = 1 − ((E + I + K′) − √((E + I + K′)² − 4·E·I)) / (2E)
 *
 * with E and I total enzyme and inhibitor concentrations and K′ the apparent Ki (the
 * Cheng–Prusoff IC50 expression at the assay's S). Evaluated in the cancellation-free form
 * v/v0 = 1 − 2I/((E + I + K′) + √((E + I + K′)² − 4EI)).
 * Use when IC50 < ~10·E, when IC50 moves with E, or when Hill slopes are steep (common practice).
 */
import { levenbergMarquardt, parameterCovariance, type LeastSquaresProblem } from "./least-squares";
import { type Interval, finiteOrNull, waldInterval95 } from "./parameter-summary";

/** Fractional activity v/v0 at total inhibitor I, total enzyme E and apparent Ki K′ (same unit).
 * Example: E = 10, K′ = 1 → 0.574166 at I = 5, 0.5 at I = 6, 0.270156 at 10, 0.084429 at 20. */
export function morrisonFractionalActivity(i: number, e: number, kApp: number): number {
  if (!(e > 0)) throw new RangeError(`Morrison: enzyme concentration must be > 0 (got ${e})`);
  if (!(i >= 0)) throw new RangeError(`Morrison: inhibitor concentration must be ≥ 0 (got ${i})`);
  if (!(kApp >= 0)) throw new RangeError(`Morrison: K′ must be ≥ 0 (got ${kApp})`);
  const sum = e + i + kApp;
  const root = Math.sqrt(Math.max(0, sum * sum - 4 * e * i));
  const denominator = sum + root;
  return denominator > 0 ? 1 - (2 * i) / denominator : 1;
}

/** IC50 = K′ + E/2 (Copeland et al. 1995). Example: E = 10 nM, K′ = 1 nM → 6 nM. */
export function morrisonIc50(e: number, kApp: number): number {
  return kApp + e / 2;
}

export interface MorrisonFit {
  kApp: number;
  kAppSe: number | null;
  kAppCi95: Interval;
  /** Uninhibited rate v0 (1 when fixed). */
  v0: number;
  v0Se: number | null;
  ic50: number;
  rss: number;
  n: number;
  dof: number;
  converged: boolean;
}

export interface MorrisonOptions {
  /** Fix v0 (e.g. 1 for data already expressed as v/v0, or 100 for % activity). Default: fitted. */
  fixedV0?: number;
}

/**
 * Fits K′ (and v0 unless fixed) of v = v0·(v/v0)_Morrison(I; E, K′) to rates `v` at inhibitor
 * concentrations `i`, with the enzyme concentration `e` known. K′ ≥ 0. Starting values: K′ on a
 * log grid, v0 projected (the model is linear in v0).
 */
export function fitMorrison(
  i: ArrayLike<number>,
  v: ArrayLike<number>,
  e: number,
  options: MorrisonOptions = {},
): MorrisonFit {
  const n = i.length;
  if (v.length !== n) throw new RangeError("fitMorrison: i and v must have the same length");
  if (!(e > 0) || !Number.isFinite(e)) throw new RangeError(`fitMorrison: enzyme concentration must be > 0 (got ${e})`);
  let imax = 0;
  for (let k = 0; k < n; k++) {
    if (!Number.isFinite(i[k]!) || i[k]! < 0) throw new RangeError(`fitMorrison: inhibitor ${k + 1} must be ≥ 0`);
    if (!Number.isFinite(v[k]!)) throw new RangeError(`fitMorrison: rate ${k + 1} must be finite`);
    imax = Math.max(imax, i[k]!);
  }
  const fixedV0 = options.fixedV0;
  const p = fixedV0 === undefined ? 2 : 1;
  if (n < p + 1) throw new RangeError(`fitMorrison: at least ${p + 1} points are needed`);
  const problem: LeastSquaresProblem = {
    nParams: p,
    nObs: n,
    lower: p === 2 ? [-Infinity, 0] : [0],
    evaluate(theta, r, jac) {
      const v0 = p === 2 ? theta[0]! : fixedV0!;
      const k = theta[p - 1]!;
      for (let j = 0; j < n; j++) {
        const ij = i[j]!;
        const sum = e + ij + k;
        const root = Math.sqrt(Math.max(0, sum * sum - 4 * e * ij));
        const den = sum + root;
        const m = den > 0 ? 1 - (2 * ij) / den : 1;
        r[j] = v[j]! - v0 * m;
        if (jac) {
          // dM/dK′ = 2I·(1 + sum/root)/den², with root > 0 whenever K′ > 0 or E ≠ I
          const dm = den > 0 && root > 0 ? (2 * ij * (1 + sum / root)) / (den * den) : 0;
          if (p === 2) {
            jac[j * 2] = m;
            jac[j * 2 + 1] = v0 * dm;
          } else jac[j] = v0 * dm;
        }
      }
    },
  };
  // Grid start over K′ from E/1000 to 10·max(I, E).
  const lo = Math.log(e / 1000);
  const hi = Math.log(10 * Math.max(imax, e));
  let bestRss = Infinity;
  let start: number[] = p === 2 ? [1, e] : [e];
  const ms = new Float64Array(n);
  for (let s = 0; s <= 30; s++) {
    const k = Math.exp(lo + ((hi - lo) * s) / 30);
    let smm = 0;
    let smv = 0;
    for (let j = 0; j < n; j++) {
      ms[j] = morrisonFractionalActivity(i[j]!, e, k);
      smm += ms[j]! * ms[j]!;
      smv += ms[j]! * v[j]!;
    }
    const v0 = fixedV0 ?? (smm > 0 ? smv / smm : 1);
    let rss = 0;
    for (let j = 0; j < n; j++) rss += (v[j]! - v0 * ms[j]!) ** 2;
    if (rss < bestRss) {
      bestRss = rss;
      start = p === 2 ? [v0, k] : [k];
    }
  }
  const res = levenbergMarquardt(problem, start);
  const cov = parameterCovariance(res, n, p);
  const dof = n - p;
  const kApp = res.theta[p - 1]!;
  const kAppSe = cov ? finiteOrNull(Math.sqrt(cov[p * p - 1]!)) : null;
  const v0 = p === 2 ? res.theta[0]! : fixedV0!;
  const v0Se = p === 2 && cov ? finiteOrNull(Math.sqrt(cov[0]!)) : null;
  return {
    kApp,
    kAppSe,
    kAppCi95: waldInterval95(kApp, kAppSe, dof),
    v0,
    v0Se,
    ic50: morrisonIc50(e, kApp),
    rss: res.rss,
    n,
    dof,
    converged: res.converged,
  };
}
