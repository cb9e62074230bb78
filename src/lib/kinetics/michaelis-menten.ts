/**
 * Michaelis–Menten fit v = Vmax·S/(Km + S) by nonlinear least squares (Michaelis & Menten 1913;
 * Briggs & Haldane 1925). Unweighted, or relative weighting (residual divided by the observed
 * rate, Motulsky & Christopoulos 2004 ch. 14 [from memory]).
 * Starting values: Km on a log grid over the substrate range with Vmax from the linear
 * least-squares solve at each Km (variable projection), then Levenberg–Marquardt.
 * Example (Puromycin, treated; Treloar 1974, R `datasets`): Vmax 212.684 (SE 6.947),
 * Km 0.064121 (SE 0.008281), residual SE 10.934 on 10 df.
 */
import { levenbergMarquardt, parameterCovariance, type LeastSquaresProblem } from "./least-squares";
import { type Interval, waldInterval95, finiteOrNull } from "./parameter-summary";

export interface MichaelisMentenFit {
  vmax: number;
  km: number;
  vmaxSe: number | null;
  kmSe: number | null;
  vmaxCi95: Interval;
  kmCi95: Interval;
  rss: number;
  /** √(RSS/(n − 2)) */
  residualSe: number | null;
  n: number;
  dof: number;
  converged: boolean;
}

export interface MichaelisMentenOptions {
  weighting?: "none" | "relative";
}

/** v = Vmax·S/(Km + S) */
export function michaelisMenten(s: number, vmax: number, km: number): number {
  return (vmax * s) / (km + s);
}

/** Grid start for (Vmax, Km): Km over the positive substrate range, Vmax projected. */
export function michaelisMentenStart(
  s: ArrayLike<number>,
  v: ArrayLike<number>,
  w?: ArrayLike<number>,
): [number, number] {
  let smin = Infinity;
  let smax = 0;
  for (let i = 0; i < s.length; i++) {
    const si = s[i]!;
    if (si > 0) {
      smin = Math.min(smin, si);
      smax = Math.max(smax, si);
    }
  }
  if (smax === 0) return [1, 1];
  const lo = Math.log(smin / 10);
  const hi = Math.log(smax * 10);
  let best: [number, number] = [1, Math.sqrt(smin * smax)];
  let bestRss = Infinity;
  for (let k = 0; k <= 24; k++) {
    const km = Math.exp(lo + ((hi - lo) * k) / 24);
    let sgg = 0;
    let sgy = 0;
    for (let i = 0; i < s.length; i++) {
      const wi = w ? w[i]! : 1;
      const g = (wi * s[i]!) / (km + s[i]!);
      sgg += g * g;
      sgy += g * wi * v[i]!;
    }
    if (!(sgg > 0)) continue;
    const vmax = sgy / sgg;
    let rss = 0;
    for (let i = 0; i < s.length; i++) {
      const wi = w ? w[i]! : 1;
      const d = wi * (v[i]! - (vmax * s[i]!) / (km + s[i]!));
      rss += d * d;
    }
    if (rss < bestRss) {
      bestRss = rss;
      best = [vmax, km];
    }
  }
  return best;
}

/** Fits Vmax and Km to substrate concentrations `s` (≥ 0) and rates `v`. */
export function fitMichaelisMenten(
  s: ArrayLike<number>,
  v: ArrayLike<number>,
  options: MichaelisMentenOptions = {},
): MichaelisMentenFit {
  const n = s.length;
  if (v.length !== n) throw new RangeError("fitMichaelisMenten: s and v must have the same length");
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(s[i]!) || s[i]! < 0)
      throw new RangeError(`fitMichaelisMenten: substrate ${i + 1} must be ≥ 0`);
    if (!Number.isFinite(v[i]!)) throw new RangeError(`fitMichaelisMenten: rate ${i + 1} must be finite`);
    if (options.weighting === "relative") {
      if (!(v[i]! > 0))
        throw new RangeError(`fitMichaelisMenten: relative weighting needs positive rates (rate ${i + 1} is ${v[i]})`);
      w[i] = 1 / v[i]!;
    } else w[i] = 1;
  }
  if (n < 3) throw new RangeError("fitMichaelisMenten: at least 3 points are needed");
  const problem: LeastSquaresProblem = {
    nParams: 2,
    nObs: n,
    lower: [-Infinity, 0],
    evaluate(theta, r, jac) {
      const vmax = theta[0]!;
      const km = theta[1]!;
      for (let i = 0; i < n; i++) {
        const si = s[i]!;
        const d = km + si;
        const wi = w[i]!;
        r[i] = wi * (v[i]! - (vmax * si) / d);
        if (jac) {
          jac[2 * i] = (wi * si) / d;
          jac[2 * i + 1] = (-wi * vmax * si) / (d * d);
        }
      }
    },
  };
  const res = levenbergMarquardt(problem, michaelisMentenStart(s, v, w));
  const cov = parameterCovariance(res, n, 2);
  const dof = n - 2;
  const vmax = res.theta[0]!;
  const km = res.theta[1]!;
  const vmaxSe = cov ? finiteOrNull(Math.sqrt(cov[0]!)) : null;
  const kmSe = cov ? finiteOrNull(Math.sqrt(cov[3]!)) : null;
  return {
    vmax,
    km,
    vmaxSe,
    kmSe,
    vmaxCi95: waldInterval95(vmax, vmaxSe, dof),
    kmCi95: waldInterval95(km, kmSe, dof),
    rss: res.rss,
    residualSe: dof > 0 ? Math.sqrt(res.rss / dof) : null,
    n,
    dof,
    converged: res.converged,
  };
}
