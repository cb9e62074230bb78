/**
 * Weighting from the data: does the scatter of replicates grow with the signal?
 *
 * Two error models are usual for assay responses: constant SD (ordinary least squares) and SD
 * proportional to the signal (relative weighting, weights 1/Y², common practice for rates and raw
 * plate signals). Which one holds is read from replicate groups (wells measured at the same
 * condition), as the slope θ of the power-of-the-mean model SD = σ·|mean|^θ: θ ≈ 0 is constant
 * noise, θ ≈ 1 proportional noise (Box, Hunter & Hunter, Statistics for Experimenters, 1978, the
 * log SD vs log mean plot; Carroll & Ruppert, Transformation and Weighting in Regression, 1988,
 * ch. 3 [from memory]).
 *
 * The slope is estimated by weighted least squares of ln s on ln |mean|. For normal data a sample
 * SD s on ν = n − 1 degrees of freedom has E[ln s] = ln σ + ½(ψ(ν/2) − ln(ν/2)) and
 * Var[ln s] = ψ′(ν/2)/4 (ψ digamma, ψ′ trigamma: ln s is ½ ln of a scaled χ²_ν; Bartlett & Kendall,
 * J R Stat Soc Suppl 1946;8:128 [from memory]), so each group's ln s is corrected for its bias and
 * weighted by the inverse of that known variance. When the groups scatter about the line more than
 * that variance allows (dispersion φ > 1) the slope's SE is inflated by √φ and a t distribution on
 * g − 2 df is used (quasi-likelihood practice, McCullagh & Nelder 1989 [from memory]).
 *
 * Decision (common practice, thresholds are conventions): relative when the slope is significantly
 * above 0 (one-sided p < 0.05) and closer to 1 than to 0 (θ ≥ 0.5); otherwise none. Fewer than
 * three replicate groups with a non-zero SD, or means spanning less than 2-fold, cannot tell the
 * two apart: none, with that reason.
 *
 * Relative weighting divides each residual by the *fitted* value, iterated to a fixed point
 * (fully iterated generalised least squares: weights 1/Ŷ² from the current fit, refit, repeat;
 * Carroll & Ruppert 1988, ch. 2 [from memory]). Dividing by the observed value instead is a
 * single fit but biased: a well that reads low by chance gets a larger weight and pulls the curve
 * down. Responses near zero would get unbounded weights, so |Ŷ| is floored at
 * RELATIVE_WEIGHT_FLOOR (5 %) of the largest |Ŷ| — a noise floor below which the signal is taken
 * to have constant SD (common practice).
 */
import {
  levenbergMarquardt,
  type LeastSquaresOptions,
  type LeastSquaresProblem,
  type LeastSquaresResult,
} from "./least-squares";
import { studentTCdf } from "./distributions";

export type Weighting = "none" | "relative";

/** A replicate group: mean, sample SD (n − 1 denominator) and count. */
export interface ReplicateGroup {
  mean: number;
  sd: number;
  n: number;
}

export interface WeightingChoice {
  weighting: Weighting;
  reason: string;
  /** Slope θ of ln SD on ln |mean| (absent when it could not be estimated). */
  slope?: number;
  slopeSe?: number;
  /** One-sided p of θ > 0. */
  p?: number;
  /** Replicate groups used for the decision. */
  groups: number;
}

/** Minimum p of the slope test and minimum slope for relative weighting (common practice). */
export const WEIGHTING_ALPHA = 0.05;
export const WEIGHTING_MIN_SLOPE = 0.5;
/** |Ŷ| is floored at this fraction of the largest |Ŷ| under relative weighting. */
export const RELATIVE_WEIGHT_FLOOR = 0.05;

/**
 * Replicate groups from condition keys: observations with the same key form a group. Only groups
 * with at least two observations are returned (a single well has no SD), in order of first
 * appearance. Example: keys [a, a, b, b], y [1, 3, 10, 14] → [{mean 2, sd 1.41421, n 2},
 * {mean 12, sd 2.82843, n 2}].
 */
export function replicateGroups(keys: readonly string[], y: ArrayLike<number>): ReplicateGroup[] {
  if (keys.length !== y.length) throw new RangeError("replicateGroups: keys and y must have the same length");
  const byKey = new Map<string, number[]>();
  for (let k = 0; k < keys.length; k++) {
    const key = keys[k]!;
    const list = byKey.get(key);
    if (list) list.push(y[k]!);
    else byKey.set(key, [y[k]!]);
  }
  const groups: ReplicateGroup[] = [];
  for (const values of byKey.values()) {
    const n = values.length;
    if (n < 2) continue;
    let mean = 0;
    for (const v of values) mean += v;
    mean /= n;
    let ss = 0;
    for (const v of values) ss += (v - mean) * (v - mean);
    groups.push({ mean, sd: Math.sqrt(ss / (n - 1)), n });
  }
  return groups;
}

/** Condition keys of a dose series: the concentration itself, so replicate wells share a key. */
export function concentrationKeys(x: ArrayLike<number>): string[] {
  const keys: string[] = new Array<string>(x.length);
  for (let i = 0; i < x.length; i++) keys[i] = String(x[i]);
  return keys;
}

/**
 * Chooses "none" or "relative" weighting from replicate groups, or from condition keys and
 * responses (see the file comment for the method and its sources).
 * Example (invented): four duplicate groups with means 10, 30, 100, 300 and SDs 1, 3, 10, 30 give
 * slope 1 and relative weighting.
 */
export function chooseWeighting(groups: readonly ReplicateGroup[]): WeightingChoice;
export function chooseWeighting(keys: readonly string[], y: ArrayLike<number>): WeightingChoice;
export function chooseWeighting(
  groupsOrKeys: readonly ReplicateGroup[] | readonly string[],
  y?: ArrayLike<number>,
): WeightingChoice {
  const all: readonly ReplicateGroup[] =
    y !== undefined
      ? replicateGroups(groupsOrKeys as readonly string[], y)
      : (groupsOrKeys as readonly ReplicateGroup[]);
  const usable = all.filter((g) => g.n >= 2 && g.sd > 0 && Number.isFinite(g.sd) && Number.isFinite(g.mean));
  if (usable.length < 3)
    return {
      weighting: "none",
      reason: `${usable.length} replicate group${usable.length === 1 ? "" : "s"} with scatter: at least 3 are needed to tell constant from proportional noise`,
      groups: usable.length,
    };
  let maxAbs = 0;
  for (const g of usable) maxAbs = Math.max(maxAbs, Math.abs(g.mean));
  // Means near zero would get unbounded leverage on the log scale: floored at 1 % of the largest.
  const floor = 0.01 * maxAbs;
  const xs = usable.map((g) => Math.log(Math.max(Math.abs(g.mean), floor)));
  const minX = Math.min(...xs);
  const maxX = Math.max(...xs);
  if (!(maxX - minX >= Math.LN2))
    return {
      weighting: "none",
      reason: "replicate means span less than 2-fold: constant and proportional noise cannot be told apart",
      groups: usable.length,
    };
  const zs: number[] = [];
  const ws: number[] = [];
  for (const g of usable) {
    const half = (g.n - 1) / 2;
    zs.push(Math.log(g.sd) - 0.5 * (digamma(half) - Math.log(half)));
    ws.push(4 / trigamma(half));
  }
  const { slope, se, dispersion } = weightedSlope(xs, zs, ws);
  const df = usable.length - 2;
  const inflated = dispersion > 1 && df > 0;
  const seUsed = inflated ? se * Math.sqrt(dispersion) : se;
  const stat = slope / seUsed;
  const p = inflated ? 1 - studentTCdf(stat, df) : 1 - normalCdf(stat);
  const detail = `slope of log SD on log mean ${slope.toFixed(2)} ± ${seUsed.toFixed(2)} over ${usable.length} replicate groups, p ${p.toPrecision(2)}`;
  if (p < WEIGHTING_ALPHA && slope >= WEIGHTING_MIN_SLOPE)
    return {
      weighting: "relative",
      reason: `SD grows with the signal (${detail}): relative weighting 1/Ŷ²`,
      slope,
      slopeSe: seUsed,
      p,
      groups: usable.length,
    };
  const why =
    p < WEIGHTING_ALPHA
      ? "SD grows with the signal but much less than proportionally"
      : "no clear growth of SD with the signal";
  return {
    weighting: "none",
    reason: `${why} (${detail}): unweighted`,
    slope,
    slopeSe: seUsed,
    p,
    groups: usable.length,
  };
}

/** Weighted least-squares slope with its known-variance SE and the dispersion Σw·e²/(g − 2). */
function weightedSlope(x: number[], z: number[], w: number[]): { slope: number; se: number; dispersion: number } {
  let sw = 0;
  let sx = 0;
  let sz = 0;
  for (let i = 0; i < x.length; i++) {
    sw += w[i]!;
    sx += w[i]! * x[i]!;
    sz += w[i]! * z[i]!;
  }
  const mx = sx / sw;
  const mz = sz / sw;
  let sxx = 0;
  let sxz = 0;
  for (let i = 0; i < x.length; i++) {
    sxx += w[i]! * (x[i]! - mx) ** 2;
    sxz += w[i]! * (x[i]! - mx) * (z[i]! - mz);
  }
  const slope = sxz / sxx;
  let chi2 = 0;
  for (let i = 0; i < x.length; i++) chi2 += w[i]! * (z[i]! - mz - slope * (x[i]! - mx)) ** 2;
  const df = x.length - 2;
  return { slope, se: 1 / Math.sqrt(sxx), dispersion: df > 0 ? chi2 / df : 1 };
}

/** Digamma ψ(x), x > 0: recurrence to x ≥ 10, then the asymptotic series (A&S 6.3.5, 6.3.18). */
export function digamma(x: number): number {
  let r = 0;
  while (x < 10) {
    r -= 1 / x;
    x += 1;
  }
  const f = 1 / (x * x);
  return r + Math.log(x) - 0.5 / x - f * (1 / 12 - f * (1 / 120 - f * (1 / 252 - f * (1 / 240 - f / 132))));
}

/** Trigamma ψ′(x), x > 0: recurrence to x ≥ 10, then the asymptotic series (A&S 6.4.6, 6.4.12). */
export function trigamma(x: number): number {
  let r = 0;
  while (x < 10) {
    r += 1 / (x * x);
    x += 1;
  }
  const f = 1 / (x * x);
  return r + 1 / x + f / 2 + (f / x) * (1 / 6 - f * (1 / 30 - f * (1 / 42 - f / 30)));
}

function normalCdf(z: number): number {
  // Φ through the t distribution with very many df would lose digits; erfc series instead
  // (A&S 7.1.26, |error| < 1.5e-7, ample for a p-value compared with 0.05).
  const t = 1 / (1 + 0.3275911 * (Math.abs(z) / Math.SQRT2));
  const y =
    ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) *
    t *
    Math.exp(-(z * z) / 2);
  return z >= 0 ? 1 - 0.5 * y : 0.5 * y;
}

/**
 * A problem whose residuals and Jacobian rows are those of `problem` multiplied by `factors[i]`:
 * a weighted fit with weights factors² (factor 0 removes an observation without renumbering). The
 * factors are read at each evaluation, so a caller may update them between solves.
 */
export function scaleRows(problem: LeastSquaresProblem, factors: ArrayLike<number>): LeastSquaresProblem {
  const n = problem.nObs;
  const p = problem.nParams;
  if (factors.length !== n) throw new RangeError(`scaleRows: ${factors.length} factors for ${n} observations`);
  return {
    nParams: p,
    nObs: n,
    lower: problem.lower,
    upper: problem.upper,
    evaluate(theta, residuals, jacobian) {
      problem.evaluate(theta, residuals, jacobian);
      for (let i = 0; i < n; i++) {
        const f = factors[i]!;
        if (f === 1) continue;
        residuals[i] = residuals[i]! * f;
        if (jacobian) for (let j = i * p, end = j + p; j < end; j++) jacobian[j] = jacobian[j]! * f;
      }
    },
  };
}

/**
 * Relative-weight factors 1/max(|ŷ_i|, floor·max|ŷ|): multiply a residual y − ŷ by its factor to
 * get the relative residual (y − ŷ)/ŷ. All factors are 1 when every ŷ is 0.
 */
export function relativeWeightFactors(
  fitted: ArrayLike<number>,
  floorFraction: number = RELATIVE_WEIGHT_FLOOR,
): Float64Array {
  let maxAbs = 0;
  for (let i = 0; i < fitted.length; i++) maxAbs = Math.max(maxAbs, Math.abs(fitted[i]!));
  const out = new Float64Array(fitted.length);
  if (!(maxAbs > 0) || !Number.isFinite(maxAbs)) return out.fill(1);
  const floor = floorFraction * maxAbs;
  for (let i = 0; i < fitted.length; i++) out[i] = 1 / Math.max(Math.abs(fitted[i]!), floor);
  return out;
}

export interface RelativeFitOptions {
  floorFraction?: number;
  /** Stop when no factor changes by more than this fraction (default 1e-7). */
  tol?: number;
  maxIterations?: number;
  lm?: LeastSquaresOptions;
  /** The ordinary fit already computed by the caller (then `start` is not used). */
  initial?: LeastSquaresResult;
}

export interface RelativeFit {
  /** The last weighted solve: its rss is Σ((y − ŷ)/ŷ)² with the final factors. */
  result: LeastSquaresResult;
  /** Final residual multipliers 1/max(|ŷ|, floor). */
  factors: Float64Array;
  /** Relative residuals (y − ŷ)/max(|ŷ|, floor) at the solution. */
  residuals: Float64Array;
  iterations: number;
  converged: boolean;
}

/**
 * Fully iterated GLS with relative weights for an unweighted problem (residuals y − f): starts
 * from the ordinary fit from `start` (or `options.initial` when the caller has it), then repeats
 * factors = relativeWeightFactors(ŷ) and a weighted solve until the factors settle. `y` are the
 * observations, so ŷ = y − residual. The fixed point solves Σ (y − f)/f²·∂f/∂θ = 0, the
 * quasi-likelihood equation for SD ∝ mean (McCullagh & Nelder 1989 [from memory]).
 */
export function fitRelativeWeighted(
  problem: LeastSquaresProblem,
  y: ArrayLike<number>,
  start: ArrayLike<number>,
  options: RelativeFitOptions = {},
): RelativeFit {
  const n = problem.nObs;
  if (y.length !== n) throw new RangeError(`fitRelativeWeighted: ${y.length} observations for a problem of ${n}`);
  const floorFraction = options.floorFraction ?? RELATIVE_WEIGHT_FLOOR;
  const tol = options.tol ?? 1e-7;
  const maxIterations = options.maxIterations ?? 50;
  const factors = new Float64Array(n).fill(1);
  const weighted = scaleRows(problem, factors);
  const raw = new Float64Array(n);
  const fitted = new Float64Array(n);
  let result = options.initial ?? levenbergMarquardt(problem, start, options.lm);
  let converged = false;
  let iterations = 0;
  while (iterations < maxIterations) {
    problem.evaluate(result.theta, raw, null);
    for (let i = 0; i < n; i++) fitted[i] = y[i]! - raw[i]!;
    const next = relativeWeightFactors(fitted, floorFraction);
    let change = 0;
    for (let i = 0; i < n; i++) change = Math.max(change, Math.abs(next[i]! - factors[i]!) / next[i]!);
    if (iterations > 0 && change <= tol) {
      converged = result.converged;
      break;
    }
    factors.set(next);
    result = levenbergMarquardt(weighted, result.theta, options.lm);
    iterations++;
    if (!Number.isFinite(result.rss)) break;
  }
  const residuals = new Float64Array(n);
  weighted.evaluate(result.theta, residuals, null);
  return { result, factors, residuals, iterations, converged };
}
