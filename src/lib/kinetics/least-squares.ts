/**
 * A small dense Levenberg–Marquardt solver for nonlinear least squares with analytic Jacobians
 * and simple lower/upper bounds, written for the 2–4 parameter models of this engine.
 *
 * Minimises F(θ) = ½·Σ r_i², r_i = w_i·(y_i − f_i(θ)). Each iteration solves
 * (JᵀJ + λ·diag(JᵀJ))·δ = Jᵀr (Marquardt 1963, SIAM J Appl Math 11:431, scaled damping) and
 * updates λ by the gain ratio ρ (Nielsen 1999; Madsen, Nielsen & Tingleff, "Methods for
 * Non-Linear Least Squares Problems", 2nd ed. 2004, Algorithm 3.16). Bounds: parameters at a
 * bound whose gradient points outward are held (active set), and steps are clipped (projected LM).
 * Stops on relative reduction of RSS (ftol, both actual and predicted, as in MINPACK), relative
 * step (xtol) or a vanishing gradient (gtol).
 *
 * Why not ml-levenberg-marquardt: its version 5 returns no covariance, stops on an absolute RSS
 * threshold (so noisy fits run to maxIterations) and differentiates numerically; the benchmark
 * (bench/kinetics.mjs) measures it against this solver and SciPy.
 *
 * Deterministic: the same input gives bit-identical output (no randomness, fixed loop order).
 */
import { choleskyInPlace, choleskySolveInPlace, symmetricPositiveDefiniteInverse } from "./small-matrix";

/** A least-squares problem: fills weighted residuals and (optionally) the weighted model Jacobian. */
export interface LeastSquaresProblem {
  readonly nParams: number;
  readonly nObs: number;
  /**
   * Writes r_i = w_i·(y_i − f_i(θ)) into `residuals` and, when `jacobian` is not null,
   * J_ij = w_i·∂f_i/∂θ_j into it (row-major nObs × nParams). Must not keep references.
   */
  evaluate(theta: Float64Array, residuals: Float64Array, jacobian: Float64Array | null): void;
  /** Optional lower bounds (−Infinity for none). */
  readonly lower?: ArrayLike<number>;
  /** Optional upper bounds (+Infinity for none). */
  readonly upper?: ArrayLike<number>;
}

export interface LeastSquaresOptions {
  maxIterations?: number;
  /** Relative RSS reduction tolerance (default 1e-12). */
  ftol?: number;
  /** Relative step tolerance (default 1e-12). */
  xtol?: number;
  /** Gradient tolerance on the cosine between r and the columns of J (default 1e-12). */
  gtol?: number;
}

export interface LeastSquaresResult {
  theta: Float64Array;
  /** Σ r_i² at the solution (weighted residual sum of squares). */
  rss: number;
  iterations: number;
  converged: boolean;
  /** How it stopped, for diagnostics. */
  reason: "ftol" | "xtol" | "gtol" | "max-iterations" | "zero-residual" | "non-finite";
  /** Unscaled covariance inverse(JᵀJ) at the solution (row-major), or null when JᵀJ is singular. */
  inverseJtJ: number[] | null;
  /** Indices of parameters that ended on a bound. */
  atBound: number[];
}

const DEFAULTS = { maxIterations: 200, ftol: 1e-12, xtol: 1e-12, gtol: 1e-12 };

interface Workspace {
  n: number;
  p: number;
  r: Float64Array;
  jac: Float64Array;
  rTrial: Float64Array;
  jacTrial: Float64Array;
  thetaTrial: Float64Array;
  a: Float64Array;
  g: Float64Array;
  m: Float64Array;
  delta: Float64Array;
  rhs: Float64Array;
  scale: Float64Array;
  free: Int32Array;
}

// Scratch arrays reused between calls of the same size: batch fitting allocates (and garbage
// collects) far less this way. Safe because a solve never re-enters itself (JS is single-threaded
// and evaluate() must not call the solver); nothing from here is returned to the caller.
const workspaces = new Map<number, Workspace>();

function workspace(n: number, p: number): Workspace {
  const key = n * 16 + p;
  let w = workspaces.get(key);
  if (!w) {
    w = {
      n,
      p,
      r: new Float64Array(n),
      jac: new Float64Array(n * p),
      rTrial: new Float64Array(n),
      jacTrial: new Float64Array(n * p),
      thetaTrial: new Float64Array(p),
      a: new Float64Array(p * p),
      g: new Float64Array(p),
      m: new Float64Array(p * p),
      delta: new Float64Array(p),
      rhs: new Float64Array(p),
      scale: new Float64Array(p),
      free: new Int32Array(p),
    };
    if (workspaces.size > 64) workspaces.clear();
    workspaces.set(key, w);
  }
  return w;
}

function sumSquares(r: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += r[i]! * r[i]!;
  return s;
}

/** Forms A = JᵀJ and g = Jᵀr. */
function normalEquations(
  jac: Float64Array,
  r: Float64Array,
  n: number,
  p: number,
  a: Float64Array,
  g: Float64Array,
): void {
  a.fill(0);
  g.fill(0);
  for (let i = 0; i < n; i++) {
    const ri = r[i]!;
    const row = i * p;
    for (let j = 0; j < p; j++) {
      const jij = jac[row + j]!;
      g[j] = g[j]! + jij * ri;
      for (let k = 0; k <= j; k++) a[j * p + k] = a[j * p + k]! + jij * jac[row + k]!;
    }
  }
  for (let j = 0; j < p; j++) for (let k = j + 1; k < p; k++) a[j * p + k] = a[k * p + j]!;
}

/** True when the gradient is negligible for every parameter not held at a bound (MINPACK gtol). */
function gradientSmall(
  a: Float64Array,
  g: Float64Array,
  theta: Float64Array,
  p: number,
  rss: number,
  gtol: number,
  lower: ArrayLike<number> | undefined,
  upper: ArrayLike<number> | undefined,
): boolean {
  if (rss === 0) return true;
  const rnorm = Math.sqrt(rss);
  for (let j = 0; j < p; j++) {
    const d = a[j * p + j]!;
    if (d === 0) continue;
    const atLower = lower !== undefined && theta[j] === lower[j] && g[j]! < 0;
    const atUpper = upper !== undefined && theta[j] === upper[j] && g[j]! > 0;
    if (atLower || atUpper) continue;
    if (Math.abs(g[j]!) / (Math.sqrt(d) * rnorm) > gtol) return false;
  }
  return true;
}

/**
 * Damped Gauss–Newton step on the free parameters (those not held at a bound by an outward
 * gradient): solves (A_ff + λ·diag(A_ff))·δ_f = g_f into `delta` (zero elsewhere). The system is
 * solved in Jacobi-scaled variables (unit diagonal), so parameters whose curvatures differ by many
 * orders of magnitude — concentrations in M next to rates in µM/s — are treated alike. Returns the
 * number of free parameters, or −1 when the damped matrix is not positive definite.
 */
function dampedStep(
  ws: Workspace,
  theta: Float64Array,
  lambda: number,
  lower: ArrayLike<number> | undefined,
  upper: ArrayLike<number> | undefined,
): number {
  const { a, g, m, rhs, delta, free, scale, p } = ws;
  let nf = 0;
  for (let j = 0; j < p; j++) {
    const blockedLow = lower !== undefined && theta[j]! <= lower[j]! && g[j]! <= 0;
    const blockedHigh = upper !== undefined && theta[j]! >= upper[j]! && g[j]! >= 0;
    if (!blockedLow && !blockedHigh) free[nf++] = j;
  }
  if (nf === 0) return 0;
  for (let s = 0; s < nf; s++) {
    const d = a[free[s]! * p + free[s]!]!;
    // A parameter with no effect (zero column) keeps scale 1: its step is then 0 (g = 0).
    scale[s] = d > 0 && Number.isFinite(d) ? 1 / Math.sqrt(d) : 1;
  }
  for (let s = 0; s < nf; s++) {
    const js = free[s]!;
    for (let t = 0; t < nf; t++) m[s * nf + t] = a[js * p + free[t]!]! * scale[s]! * scale[t]!;
    const d = a[js * p + js]!;
    // Scaled diagonal is 1 (or 0 for a dead parameter): Marquardt damping adds λ, at least λ·1e-12.
    m[s * nf + s] = m[s * nf + s]! + lambda * (d > 0 ? 1 : 1e-12) + (d > 0 ? 0 : 1e-300);
    rhs[s] = g[js]! * scale[s]!;
  }
  if (!choleskyInPlace(m, nf)) return -1;
  choleskySolveInPlace(m, nf, rhs);
  delta.fill(0);
  for (let s = 0; s < nf; s++) delta[free[s]!] = rhs[s]! * scale[s]!;
  return nf;
}

/** θ_trial = clip(θ + δ) into the box; δ becomes the actual (clipped) step. Returns true when
 * every component of the step is below xtol relative to its parameter. */
function projectTrial(
  ws: Workspace,
  theta: Float64Array,
  xtol: number,
  lower: ArrayLike<number> | undefined,
  upper: ArrayLike<number> | undefined,
): boolean {
  const { delta, thetaTrial, p } = ws;
  let stepSmall = true;
  for (let j = 0; j < p; j++) {
    let v = theta[j]! + delta[j]!;
    if (lower && v < lower[j]!) v = lower[j]!;
    if (upper && v > upper[j]!) v = upper[j]!;
    thetaTrial[j] = v;
    delta[j] = v - theta[j]!;
    if (Math.abs(delta[j]!) > xtol * (Math.abs(theta[j]!) + xtol)) stepSmall = false;
  }
  return stepSmall;
}

/** Predicted reduction of ½‖r‖² for step δ under the quadratic model: δᵀg − ½δᵀAδ. */
function predictedReduction(ws: Workspace): number {
  const { delta, g, a, p } = ws;
  let dg = 0;
  let dad = 0;
  for (let j = 0; j < p; j++) {
    dg += delta[j]! * g[j]!;
    let ad = 0;
    for (let k = 0; k < p; k++) ad += a[j * p + k]! * delta[k]!;
    dad += delta[j]! * ad;
  }
  return dg - 0.5 * dad;
}

/**
 * Solves min ½‖r(θ)‖² from `start` by bounded Levenberg–Marquardt (see the file comment).
 * The loop body lives in small helpers: V8 optimises small functions after a few calls, while a
 * large function stays interpreted for about a thousand fits — which dominated batch runs.
 */
export function levenbergMarquardt(
  problem: LeastSquaresProblem,
  start: ArrayLike<number>,
  options: LeastSquaresOptions = {},
): LeastSquaresResult {
  const maxIterations = options.maxIterations ?? DEFAULTS.maxIterations;
  const ftol = options.ftol ?? DEFAULTS.ftol;
  const xtol = options.xtol ?? DEFAULTS.xtol;
  const gtol = options.gtol ?? DEFAULTS.gtol;
  const n = problem.nObs;
  const p = problem.nParams;
  const lower = problem.lower;
  const upper = problem.upper;

  const theta = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    let v = start[j]!;
    if (lower && v < lower[j]!) v = lower[j]!;
    if (upper && v > upper[j]!) v = upper[j]!;
    theta[j] = v;
  }
  const ws = workspace(n, p);
  const { thetaTrial, a, g } = ws;
  // Residuals and Jacobian are evaluated together at each trial point; on acceptance the trial
  // buffers become the current ones (a swap), so no point is evaluated twice.
  let r = ws.r;
  let jac = ws.jac;
  let rTrial = ws.rTrial;
  let jacTrial = ws.jacTrial;

  problem.evaluate(theta, r, jac);
  let rss = sumSquares(r, n);
  if (!Number.isFinite(rss)) {
    return { theta, rss, iterations: 0, converged: false, reason: "non-finite", inverseJtJ: null, atBound: [] };
  }
  normalEquations(jac, r, n, p, a, g);
  let lambda = 1e-3;
  let nu = 2;
  let iterations = 0;
  let reason: LeastSquaresResult["reason"] = "max-iterations";
  let converged = false;

  if (rss === 0) {
    reason = "zero-residual";
    converged = true;
  } else if (gradientSmall(a, g, theta, p, rss, gtol, lower, upper)) {
    reason = "gtol";
    converged = true;
  }

  while (!converged && iterations < maxIterations) {
    iterations++;
    const nf = dampedStep(ws, theta, lambda, lower, upper);
    if (nf === 0) {
      reason = "gtol";
      converged = true;
      break;
    }
    if (nf < 0) {
      lambda *= nu;
      nu *= 2;
      if (!Number.isFinite(lambda) || lambda > 1e300) {
        reason = "non-finite";
        break;
      }
      continue;
    }
    if (projectTrial(ws, theta, xtol, lower, upper)) {
      reason = "xtol";
      converged = true;
      break;
    }
    const predicted = predictedReduction(ws);
    problem.evaluate(thetaTrial, rTrial, jacTrial);
    const rssTrial = sumSquares(rTrial, n);
    const actual = 0.5 * (rss - rssTrial);
    const rho = predicted > 0 ? actual / predicted : -1;
    if (Number.isFinite(rssTrial) && actual > 0 && rho > 0) {
      const oldRss = rss;
      theta.set(thetaTrial);
      const rSwap = r;
      r = rTrial;
      rTrial = rSwap;
      const jSwap = jac;
      jac = jacTrial;
      jacTrial = jSwap;
      rss = rssTrial;
      normalEquations(jac, r, n, p, a, g);
      const f = 2 * rho - 1;
      lambda *= Math.max(1 / 3, 1 - f * f * f);
      nu = 2;
      if (rss === 0) {
        reason = "zero-residual";
        converged = true;
      } else if (2 * actual <= ftol * oldRss && 2 * predicted <= ftol * oldRss) {
        reason = "ftol";
        converged = true;
      } else if (gradientSmall(a, g, theta, p, rss, gtol, lower, upper)) {
        reason = "gtol";
        converged = true;
      }
    } else {
      lambda *= nu;
      nu *= 2;
      if (!Number.isFinite(lambda) || lambda > 1e300) {
        // No step can reduce RSS any further at machine precision: we are at the minimum.
        reason = "ftol";
        converged = true;
        break;
      }
    }
  }
  return finish(theta, rss, iterations, converged, reason, a, p, lower, upper);
}

function finish(
  theta: Float64Array,
  rss: number,
  iterations: number,
  converged: boolean,
  reason: LeastSquaresResult["reason"],
  a: Float64Array,
  p: number,
  lower: ArrayLike<number> | undefined,
  upper: ArrayLike<number> | undefined,
): LeastSquaresResult {
  const atBound: number[] = [];
  let finite = Number.isFinite(rss);
  for (let j = 0; j < p; j++) {
    if (!Number.isFinite(theta[j]!)) finite = false;
    if ((lower && theta[j] === lower[j]) || (upper && theta[j] === upper[j])) atBound.push(j);
  }
  return {
    theta,
    rss,
    iterations,
    converged: converged && finite,
    reason: finite ? reason : "non-finite",
    inverseJtJ: finite ? symmetricPositiveDefiniteInverse(a, p) : null,
    atBound,
  };
}

/**
 * Standard errors from the linearised covariance Cov(θ) = inverse(JᵀJ)·RSS/(n − p)
 * (Bates & Watts, Nonlinear Regression Analysis and Its Applications, 1988, §2.3).
 * Returns the covariance matrix (row-major) or null when it cannot be formed.
 */
export function parameterCovariance(result: LeastSquaresResult, nObs: number, nParams: number): number[] | null {
  const dof = nObs - nParams;
  if (dof <= 0 || result.inverseJtJ === null) return null;
  const s2 = result.rss / dof;
  return result.inverseJtJ.map((v) => v * s2);
}
