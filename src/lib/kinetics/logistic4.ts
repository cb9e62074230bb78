/**
 * Four-parameter logistic (4PL) dose-response fit with log10 IC50 as the fitted parameter.
 *
 *   y = Bottom + (Top − Bottom) / (1 + 10^(h·(log10 x − log10 IC50)))
 *
 * (Hill 1910; the form used in DeLean, Munson & Rodbard, Am J Physiol 1978;235:E97, and equal to
 * R's SSfpl on ln x with IC50 = e^xmid, h = 1/scal.) Standard errors from the Jacobian,
 * Cov = inverse(JᵀJ)·RSS/(n − p) (Bates & Watts 1988); 95 % CI of IC50 = 10^(log10 IC50 ±
 * t(0.975, n − p)·SE), asymmetric after back-transformation.
 *
 * The model is symmetric under (Top, Bottom, h) → (Bottom, Top, −h). Results are reported in the
 * canonical form Top ≥ Bottom with `hill` = |h| ≥ 0 and `direction` telling whether the response
 * falls or rises with concentration — so a falling inhibition curve and a rising activation curve
 * both report a positive Hill slope. With a fixed Top or Bottom the fitted sign is kept.
 *
 * Starting values need no tuning: a grid over log10 IC50 (tested range ± 1 decade) at |h| = 1,
 * where Top and Bottom come from a linear least-squares solve at each grid point (variable
 * projection, Golub & Pereyra, SIAM J Numer Anal 1973;10:413), then Levenberg–Marquardt; when that
 * does not converge or leaves R² < 0.95, a second grid over |h| ∈ {0.5, 1, 2} is tried and the
 * better fit kept.
 * Concentration 0 is accepted (it sits on the low-concentration plateau).
 */
import {
  levenbergMarquardt,
  parameterCovariance,
  type LeastSquaresProblem,
  type LeastSquaresResult,
} from "./least-squares";
import { tCritical95 } from "./distributions";
import { fitRelativeWeighted, RELATIVE_WEIGHT_FLOOR } from "./weighting";

const LN10 = Math.LN10;

export interface Logistic4Options {
  /** Fix Top at this value instead of fitting it. */
  fixedTop?: number;
  /** Fix Bottom at this value instead of fitting it. */
  fixedBottom?: number;
  /**
   * "none" (default): ordinary least squares. "relative": residuals divided by the fitted value,
   * iterated to a fixed point (weights 1/Ŷ², |Ŷ| floored at `weightFloor` of the largest |Ŷ|;
   * see weighting.ts for why fitted rather than observed values).
   */
  weighting?: "none" | "relative";
  /** Floor of |Ŷ| under relative weighting as a fraction of the largest |Ŷ| (default 0.05). */
  weightFloor?: number;
}

export type Logistic4Flag =
  | "ic50-above-range"
  | "ic50-below-range"
  | "plateau-not-reached"
  | "hill-outside-0.5-2"
  | "ci-wider-than-10-fold"
  | "too-few-points"
  | "poor-fit"
  | "not-converged";

export interface Logistic4Fit {
  ic50: number | null;
  log10Ic50: number | null;
  log10Ic50Se: number | null;
  /** 95 % CI of IC50 [lo, hi]; an end is null where it is unbounded or cannot be computed. */
  ic50Ci95: [number | null, number | null];
  /** Hill slope magnitude |h|. */
  hill: number | null;
  hillSe: number | null;
  direction: "falling" | "rising" | "flat";
  top: number | null;
  topSe: number | null;
  bottom: number | null;
  bottomSe: number | null;
  rss: number;
  rSquared: number | null;
  n: number;
  nParams: number;
  dof: number;
  converged: boolean;
  iterations: number;
  flags: Logistic4Flag[];
  /**
   * Present only on weighted fits ("relative"): then rss is Σ((y − Ŷ)/max(|Ŷ|, floor))², R² is on
   * the same weighted scale and the SEs come from the weighted fit. Unweighted results carry no
   * such field, so they are unchanged.
   */
  weighting?: "relative";
}

/** Evaluates the 4PL at concentration x (x ≥ 0). */
export function logistic4(x: number, top: number, bottom: number, log10Ic50: number, hill: number): number {
  return bottom + (top - bottom) * logisticFraction(x > 0 ? Math.log10(x) : -Infinity, log10Ic50, hill);
}

/**
 * The fitted curve of a reported fit at concentration x, or null when the fit has no finite
 * parameters. The report is canonical (Top ≥ Bottom, hill = |h|, `direction`), so the sign of h is
 * recovered from the direction: a falling curve has (Top − Bottom)·h > 0.
 */
export function logistic4Fitted(fit: Logistic4Fit, x: number): number | null {
  const { top, bottom, log10Ic50, hill } = fit;
  if (top === null || bottom === null || log10Ic50 === null || hill === null) return null;
  if (fit.direction === "flat") return bottom + (top - bottom) * 0.5;
  const h = (fit.direction === "falling") === top >= bottom ? hill : -hill;
  return logistic4(x, top, bottom, log10Ic50, h);
}

/** g = 1/(1 + 10^(h·(lx − L))), computed without overflow; lx may be −Infinity (x = 0). */
function logisticFraction(lx: number, l: number, h: number): number {
  if (lx === -Infinity) return h > 0 ? 1 : h < 0 ? 0 : 0.5;
  const z = h * (lx - l) * LN10;
  if (z > 0) {
    const e = Math.exp(-z);
    return e / (1 + e);
  }
  return 1 / (1 + Math.exp(z));
}

/** Builds the least-squares problem over the free subset of [bottom, top, L, h]. */
type Problem4 = LeastSquaresProblem & { unpack(theta: ArrayLike<number>): [number, number, number, number] };

function makeProblem(
  lx: readonly number[],
  y: readonly number[],
  fixedTop: number | undefined,
  fixedBottom: number | undefined,
): Problem4 {
  const n = y.length;
  const freeBottom = fixedBottom === undefined;
  const freeTop = fixedTop === undefined;
  const p = (freeBottom ? 1 : 0) + (freeTop ? 1 : 0) + 2;
  const unpack = (theta: ArrayLike<number>): [number, number, number, number] => {
    let k = 0;
    const b = freeBottom ? theta[k++]! : fixedBottom!;
    const t = freeTop ? theta[k++]! : fixedTop!;
    return [b, t, theta[k]!, theta[k + 1]!];
  };
  return {
    nParams: p,
    nObs: n,
    unpack,
    evaluate(theta, residuals, jac) {
      // Direct reads (no array from unpack): this runs for every iteration of every fit.
      const kTop = freeBottom ? 1 : 0;
      const kL = kTop + (freeTop ? 1 : 0);
      const b = freeBottom ? theta[0]! : fixedBottom!;
      const t = freeTop ? theta[kTop]! : fixedTop!;
      const l = theta[kL]!;
      const h = theta[kL + 1]!;
      const span = t - b;
      for (let i = 0; i < n; i++) {
        const xi = lx[i]!;
        let g: number;
        let gq: number; // g·(1 − g)
        if (xi === -Infinity) {
          g = h > 0 ? 1 : h < 0 ? 0 : 0.5;
          gq = 0;
        } else {
          const z = h * (xi - l) * LN10;
          if (z > 0) {
            const e = Math.exp(-z);
            g = e / (1 + e);
            gq = g / (1 + e);
          } else {
            const e = Math.exp(z);
            g = 1 / (1 + e);
            gq = g * (e / (1 + e));
          }
        }
        residuals[i] = y[i]! - (b + span * g);
        if (jac) {
          const row = i * p;
          let k = 0;
          if (freeBottom) jac[row + k++] = 1 - g;
          if (freeTop) jac[row + k++] = g;
          jac[row + k] = span * gq * LN10 * h;
          jac[row + k + 1] = xi === -Infinity ? 0 : -span * gq * LN10 * (xi - l);
        }
      }
    },
  };
}

/**
 * The unweighted least-squares problem of the 4PL (residuals y − f over the free subset of
 * [Bottom, Top, log10 IC50, h]) and the parameter vector of a reported fit in that order, for
 * callers that reweight or robustify a fit (robust.ts, weighting.ts). Concentrations must be ≥ 0.
 */
export function logistic4Problem(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  options: Pick<Logistic4Options, "fixedTop" | "fixedBottom"> = {},
): LeastSquaresProblem {
  const lx: number[] = [];
  const yy: number[] = [];
  for (let i = 0; i < x.length; i++) {
    lx.push(x[i]! > 0 ? Math.log10(x[i]!) : -Infinity);
    yy.push(y[i]!);
  }
  return makeProblem(lx, yy, options.fixedTop, options.fixedBottom);
}

/** Parameters of `fit` as the vector `logistic4Problem` expects, or null when the fit is not finite. */
export function logistic4Theta(
  fit: Logistic4Fit,
  options: Pick<Logistic4Options, "fixedTop" | "fixedBottom"> = {},
): number[] | null {
  const { top, bottom, log10Ic50, hill } = fit;
  if (top === null || bottom === null || log10Ic50 === null || hill === null) return null;
  const h = fit.direction === "flat" ? 0 : (fit.direction === "falling") === top >= bottom ? hill : -hill;
  // A fixed asymptote keeps its place; free ones are reported canonically (Top ≥ Bottom), which is
  // the same curve as the fitted orientation.
  const theta: number[] = [];
  if (options.fixedBottom === undefined) theta.push(bottom);
  if (options.fixedTop === undefined) theta.push(top);
  theta.push(log10Ic50, h);
  return theta;
}

/**
 * The grid start of the 4PL for (x, y) without the solver: the best point of a grid over
 * log10 IC50 (tested range ± 1 decade) and |h| ∈ {0.5, 1, 2} (`quick`: |h| = 1 only), with Top and
 * Bottom solved linearly at each (variable projection). Returns the parameters in
 * logistic4Problem's order and their residual sum of squares: a cheap way to compare many subsets
 * of a series before fitting any.
 */
export function logistic4Start(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  options: Pick<Logistic4Options, "fixedTop" | "fixedBottom"> & { quick?: boolean } = {},
): { theta: number[]; rss: number } {
  const { fixedTop, fixedBottom, quick } = options;
  const lx: number[] = [];
  const yy: number[] = [];
  for (let i = 0; i < x.length; i++) {
    lx.push(x[i]! > 0 ? Math.log10(x[i]!) : -Infinity);
    yy.push(y[i]!);
  }
  const bothFree = fixedTop === undefined && fixedBottom === undefined;
  const hs = quick
    ? bothFree
      ? GRID_H_QUICK_FREE
      : GRID_H_QUICK_FIXED
    : bothFree
      ? GRID_H_FULL_FREE
      : GRID_H_FULL_FIXED;
  const s = gridStart(x, lx, yy, fixedTop, fixedBottom, hs);
  const theta: number[] = [];
  if (fixedBottom === undefined) theta.push(s.bottom);
  if (fixedTop === undefined) theta.push(s.top);
  theta.push(s.l, s.h);
  return { theta, rss: s.rss };
}

interface Start {
  bottom: number;
  top: number;
  l: number;
  h: number;
  rss: number;
}

/** Grid start by variable projection: for fixed (IC50, h) the model is linear in Bottom and Top.
 * The grid needs no exponentials: 10^(h·(log10 x − log10 IC50)) = (x/IC50)^h with h ∈ {±½, ±1, ±2}. */
function gridStart(
  x: ArrayLike<number>,
  lx: readonly number[],
  y: readonly number[],
  fixedTop: number | undefined,
  fixedBottom: number | undefined,
  hs: readonly number[],
): Start {
  const n = y.length;
  let lmin = Infinity;
  let lmax = -Infinity;
  let sy = 0;
  for (let i = 0; i < n; i++) {
    const v = lx[i]!;
    if (v !== -Infinity) {
      if (v < lmin) lmin = v;
      if (v > lmax) lmax = v;
    }
    sy += y[i]!;
  }
  if (lmin === Infinity) {
    lmin = 0;
    lmax = 0;
  }
  const ymean = sy / n;
  const bothFree = fixedTop === undefined && fixedBottom === undefined;
  const steps = 8;
  const lo = lmin - 1;
  const hi = lmax + 1;
  const best: Start = {
    bottom: fixedBottom ?? ymean,
    top: fixedTop ?? ymean,
    l: 0.5 * (lmin + lmax),
    h: 1,
    rss: Infinity,
  };
  const g = gridScratch.length >= n ? gridScratch : (gridScratch = new Float64Array(n));
  for (const h of hs) {
    for (let s = 0; s <= steps; s++) {
      const l = lo + ((hi - lo) * s) / steps;
      const invC = Math.exp(-l * LN10); // Math.pow(10, ·) measured ~10× slower in V8
      let sg = 0;
      let sgg = 0;
      let sgy = 0;
      for (let i = 0; i < n; i++) {
        const ratio = x[i]! * invC; // x/IC50, 0 for x = 0
        const base = h === 1 || h === -1 ? ratio : h === 2 || h === -2 ? ratio * ratio : Math.sqrt(ratio);
        const u = h > 0 ? base : 1 / base; // 1/0 = Infinity gives g = 0 as it should
        const gi = 1 / (1 + u);
        g[i] = gi;
        sg += gi;
        sgg += gi * gi;
        sgy += gi * y[i]!;
      }
      // y ≈ b + (t − b)·g = b + c·g
      let b: number;
      let t: number;
      if (bothFree) {
        const det = n * sgg - sg * sg;
        if (!(det > 1e-12 * n * n)) continue;
        const c = (n * sgy - sg * sy) / det;
        b = (sy - c * sg) / n;
        t = b + c;
      } else if (fixedTop === undefined) {
        // y − b(1 − g) = t·g
        b = fixedBottom!;
        if (!(sgg > 0)) continue;
        t = (sgy - b * (sg - sgg)) / sgg;
      } else if (fixedBottom === undefined) {
        t = fixedTop;
        // y − t·g = b(1 − g)
        const s1 = n - 2 * sg + sgg; // Σ(1−g)²
        if (!(s1 > 0)) continue;
        b = (sy - sgy - t * (sg - sgg)) / s1;
      } else {
        b = fixedBottom;
        t = fixedTop;
      }
      let rss = 0;
      for (let i = 0; i < n; i++) {
        const d = y[i]! - (b + (t - b) * g[i]!);
        rss += d * d;
      }
      if (rss < best.rss) {
        best.bottom = b;
        best.top = t;
        best.l = l;
        best.h = h;
        best.rss = rss;
      }
    }
  }
  return best;
}

// With both asymptotes free the sign of h is redundant (symmetry), so only h > 0 is tried.
// The quick grid (|h| = 1) serves typical curves; the full one is the fallback.
const GRID_H_QUICK_FREE = [1];
const GRID_H_QUICK_FIXED = [1, -1];
const GRID_H_FULL_FREE = [0.5, 1, 2];
const GRID_H_FULL_FIXED = [0.5, 1, 2, -0.5, -1, -2];
let gridScratch = new Float64Array(16);

// Relative tolerances 1e-10: two orders of magnitude tighter than SciPy curve_fit's default
// (1.49e-8), and a parameter change far below 1e-4 of its standard error at the stop.
const LM_OPTIONS = { ftol: 1e-10, xtol: 1e-10, gtol: 1e-10 };

/**
 * Fits the 4PL to concentrations `x` (≥ 0, any unit) and responses `y`. Throws on invalid input
 * (negative or non-finite values, fewer points than parameters + 1, fewer distinct concentrations
 * than parameters, or fewer than 3).
 *
 * Flags (common practice; thresholds are conventions, not laws): IC50 outside the tested
 * concentration range; fewer than two distinct concentrations on a fitted plateau (within 20 % of
 * the span of a free asymptote); Hill slope outside 0.5–2; 95 % CI wider than 10-fold or
 * unbounded; fewer than 6 distinct concentrations or fewer than 3 residual degrees of freedom;
 * R² below 0.8; solver not converged.
 *
 * Example (R `DNase` run 1, see logistic4.test.ts): bottom −0.0078971, top 2.37724,
 * EC50 4.5150 (95 % CI 3.6146–5.6396), Hill 0.94111, RSS 0.0047073.
 */
export function fitLogistic4(x: ArrayLike<number>, y: ArrayLike<number>, options: Logistic4Options = {}): Logistic4Fit {
  // Split into small functions on purpose: V8 optimises small functions much sooner, which is
  // most of the cost of a batch of 10⁴ curves in a fresh process.
  const { fixedTop, fixedBottom } = options;
  const input = prepareInput(x, y, fixedTop, fixedBottom);
  const problem = makeProblem(input.lx, input.y, fixedTop, fixedBottom);
  const p = problem.nParams;
  const n = input.n;
  if (n < p + 1)
    throw new RangeError(
      `fitLogistic4: ${n} points cannot fit ${p} parameters with an error estimate; at least ${p + 1} are needed`,
    );
  const minDistinct = Math.max(3, p);
  if (input.distinct < minDistinct)
    throw new RangeError(`fitLogistic4: ${input.distinct} distinct concentrations; at least ${minDistinct} are needed`);
  const res = solve(problem, x, input, fixedTop, fixedBottom);
  if (options.weighting === "relative") return fitRelative(problem, res, x, input, options);
  if (options.weighting !== undefined && options.weighting !== "none")
    throw new RangeError(`fitLogistic4: weighting must be "none" or "relative" (got ${String(options.weighting)})`);
  return summarise(problem, res, x, input, fixedTop, fixedBottom);
}

/** Relative weighting: GLS iterations from the ordinary fit, summarised on the weighted scale. */
function fitRelative(
  problem: Problem4,
  ordinary: LeastSquaresResult,
  x: ArrayLike<number>,
  input: Input,
  options: Logistic4Options,
): Logistic4Fit {
  const floorFraction = options.weightFloor ?? RELATIVE_WEIGHT_FLOOR;
  if (!(floorFraction > 0 && floorFraction <= 1))
    throw new RangeError(`fitLogistic4: weightFloor must be in (0, 1] (got ${floorFraction})`);
  const gls = fitRelativeWeighted(problem, input.y, [], { initial: ordinary, lm: LM_OPTIONS, floorFraction });
  const f = gls.factors;
  // Total sum of squares on the weighted scale, about the weighted mean.
  let sw = 0;
  let swy = 0;
  for (let i = 0; i < input.n; i++) {
    sw += f[i]! * f[i]!;
    swy += f[i]! * f[i]! * input.y[i]!;
  }
  const mean = swy / sw;
  let tss = 0;
  for (let i = 0; i < input.n; i++) tss += (f[i]! * (input.y[i]! - mean)) ** 2;
  const res: LeastSquaresResult = { ...gls.result, converged: gls.converged && gls.result.converged };
  const fit = summarise(problem, res, x, { ...input, tss }, options.fixedTop, options.fixedBottom);
  fit.weighting = "relative";
  return fit;
}

interface Input {
  n: number;
  lx: number[];
  y: number[];
  distinct: number;
  lmin: number;
  lmax: number;
  tss: number;
}

function prepareInput(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  fixedTop: number | undefined,
  fixedBottom: number | undefined,
): Input {
  const n = x.length;
  if (y.length !== n) throw new RangeError("fitLogistic4: x and y must have the same length");
  if (fixedTop !== undefined && !Number.isFinite(fixedTop))
    throw new RangeError("fitLogistic4: fixedTop must be finite");
  if (fixedBottom !== undefined && !Number.isFinite(fixedBottom))
    throw new RangeError("fitLogistic4: fixedBottom must be finite");
  // Plain arrays: small typed arrays cost an off-heap allocation each, which shows in batch runs.
  const lx: number[] = new Array<number>(n);
  const yy: number[] = new Array<number>(n);
  let lmin = Infinity;
  let lmax = -Infinity;
  let ysum = 0;
  for (let i = 0; i < n; i++) {
    const xi = x[i]!;
    const yi = y[i]!;
    if (!Number.isFinite(xi) || xi < 0)
      throw new RangeError(`fitLogistic4: concentration ${i + 1} must be a finite number ≥ 0 (got ${xi})`);
    if (!Number.isFinite(yi)) throw new RangeError(`fitLogistic4: response ${i + 1} must be finite (got ${yi})`);
    const l = xi > 0 ? Math.log10(xi) : -Infinity;
    lx[i] = l;
    yy[i] = yi;
    ysum += yi;
    if (xi > 0) {
      if (l < lmin) lmin = l;
      if (l > lmax) lmax = l;
    }
  }
  const ymean = ysum / n;
  let tss = 0;
  for (let i = 0; i < n; i++) tss += (yy[i]! - ymean) * (yy[i]! - ymean);
  return { n, lx, y: yy, distinct: countDistinct(x), lmin, lmax, tss };
}

/** Number of distinct values: a pairwise scan for the usual short series (no allocation), a
 * numeric typed-array sort for long ones. */
function countDistinct(x: ArrayLike<number>): number {
  const n = x.length;
  if (n > 64) {
    const sorted = Float64Array.from(x).sort();
    let count = 1;
    for (let i = 1; i < n; i++) if (sorted[i] !== sorted[i - 1]) count++;
    return count;
  }
  let count = 0;
  for (let i = 0; i < n; i++) {
    let seen = false;
    for (let j = 0; j < i; j++) {
      if (x[j] === x[i]) {
        seen = true;
        break;
      }
    }
    if (!seen) count++;
  }
  return count;
}

function solveFrom(
  problem: Problem4,
  x: ArrayLike<number>,
  input: Input,
  fixedTop: number | undefined,
  fixedBottom: number | undefined,
  hs: readonly number[],
): LeastSquaresResult {
  const s = gridStart(x, input.lx, input.y, fixedTop, fixedBottom, hs);
  const start: number[] = [];
  if (fixedBottom === undefined) start.push(s.bottom);
  if (fixedTop === undefined) start.push(s.top);
  start.push(s.l, s.h);
  return levenbergMarquardt(problem, start, LM_OPTIONS);
}

function solve(
  problem: Problem4,
  x: ArrayLike<number>,
  input: Input,
  fixedTop: number | undefined,
  fixedBottom: number | undefined,
): LeastSquaresResult {
  const bothFree = fixedTop === undefined && fixedBottom === undefined;
  let res = solveFrom(problem, x, input, fixedTop, fixedBottom, bothFree ? GRID_H_QUICK_FREE : GRID_H_QUICK_FIXED);
  if (!res.converged || !(res.rss <= 0.05 * input.tss)) {
    // Not converged or R² < 0.95 from the quick start: try the full grid and keep the better fit.
    const again = solveFrom(problem, x, input, fixedTop, fixedBottom, bothFree ? GRID_H_FULL_FREE : GRID_H_FULL_FIXED);
    if (again.converged && (!res.converged || again.rss < res.rss)) res = again;
  }
  return res;
}

function standardError(cov: number[] | null, k: number, p: number): number | null {
  if (!cov) return null;
  const v = cov[k * p + k]!;
  return v >= 0 && Number.isFinite(v) ? Math.sqrt(v) : null;
}

function pow10(v: number): number {
  return Math.exp(v * LN10);
}

function summarise(
  problem: Problem4,
  res: LeastSquaresResult,
  x: ArrayLike<number>,
  input: Input,
  fixedTop: number | undefined,
  fixedBottom: number | undefined,
): Logistic4Fit {
  const { n, tss } = input;
  const p = problem.nParams;
  const [b0, t0, l, h0] = problem.unpack(res.theta);
  const cov = parameterCovariance(res, n, p);
  let k = 0;
  const bSe0 = fixedBottom === undefined ? standardError(cov, k++, p) : null;
  const tSe0 = fixedTop === undefined ? standardError(cov, k++, p) : null;
  const lSe = standardError(cov, k, p);
  const hSe = standardError(cov, k + 1, p);
  // Canonical form Top ≥ Bottom when both are fitted (the model is symmetric under the swap).
  const swap = fixedTop === undefined && fixedBottom === undefined && t0 < b0;
  const top = swap ? b0 : t0;
  const bottom = swap ? t0 : b0;
  const topSe = swap ? bSe0 : tSe0;
  const bottomSe = swap ? tSe0 : bSe0;
  const h = swap ? -h0 : h0;
  const dof = n - p;
  const finite = Number.isFinite(l) && Number.isFinite(h) && Number.isFinite(top) && Number.isFinite(bottom);
  const rSquared = tss > 0 && finite ? 1 - res.rss / tss : null;
  const slope = (top - bottom) * h;
  const direction: Logistic4Fit["direction"] = !(slope !== 0) || !finite ? "flat" : slope > 0 ? "falling" : "rising";
  let ic50: number | null = null;
  let ci: [number | null, number | null] = [null, null];
  if (finite) {
    ic50 = pow10(l);
    if (!Number.isFinite(ic50) || ic50 === 0) ic50 = null;
    if (lSe !== null && dof > 0) {
      const half = tCritical95(dof) * lSe;
      const lo = pow10(l - half);
      const hi = pow10(l + half);
      ci = [lo > 0 && Number.isFinite(lo) ? lo : null, Number.isFinite(hi) ? hi : null];
    }
  }
  const flags = computeFlags(
    x,
    input,
    finite,
    l,
    h,
    ci,
    dof,
    rSquared,
    res.converged,
    fixedTop === undefined,
    fixedBottom === undefined,
  );
  return {
    ic50,
    log10Ic50: finite ? l : null,
    log10Ic50Se: lSe,
    ic50Ci95: ci,
    hill: finite ? Math.abs(h) : null,
    hillSe: hSe,
    direction,
    top: finite ? top : null,
    topSe,
    bottom: finite ? bottom : null,
    bottomSe,
    rss: res.rss,
    rSquared,
    n,
    nParams: p,
    dof,
    converged: res.converged,
    iterations: res.iterations,
    flags,
  };
}

function computeFlags(
  x: ArrayLike<number>,
  input: Input,
  finite: boolean,
  l: number,
  h: number,
  ci: [number | null, number | null],
  dof: number,
  rSquared: number | null,
  converged: boolean,
  topFree: boolean,
  bottomFree: boolean,
): Logistic4Flag[] {
  const flags: Logistic4Flag[] = [];
  if (finite && input.lmax > -Infinity) {
    if (l > input.lmax) flags.push("ic50-above-range");
    else if (l < input.lmin) flags.push("ic50-below-range");
  }
  if (finite) {
    // Distinct concentrations whose fitted response lies within 20 % of the span of a free
    // asymptote; f = bottom + (top − bottom)·g holds after canonicalisation, so g ≥ 0.8 is Top.
    const nearTop: number[] = [];
    const nearBottom: number[] = [];
    for (let i = 0; i < input.n; i++) {
      const g = logisticFraction(input.lx[i]!, l, h);
      if (g >= 0.8) nearTop.push(x[i]!);
      if (g <= 0.2) nearBottom.push(x[i]!);
    }
    if ((topFree && countDistinct(nearTop) < 2) || (bottomFree && countDistinct(nearBottom) < 2))
      flags.push("plateau-not-reached");
    const absH = Math.abs(h);
    if (absH < 0.5 || absH > 2) flags.push("hill-outside-0.5-2");
  }
  if (ci[0] === null || ci[1] === null || ci[1] / ci[0] > 10) flags.push("ci-wider-than-10-fold");
  if (input.distinct < 6 || dof < 3) flags.push("too-few-points");
  if (rSquared === null || rSquared < 0.8) flags.push("poor-fit");
  if (!converged) flags.push("not-converged");
  return flags;
}
