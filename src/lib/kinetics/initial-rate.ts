/**
 * Initial rate from a kinetic read (signal vs time of one well): the slope over the early linear
 * phase, with the window chosen automatically, its R², and a flag for curved progress.
 *
 * Common practice (NIH Assay Guidance Manual, "Basics of Enzymatic Assays for HTS" [from memory]):
 * the initial rate is measured while ≤ 10 % of substrate is converted and the signal is linear in
 * time. Here:
 * - Linear least squares on a window [start, end] (slope, intercept, SE of the slope, R²).
 * - Linearity test of a window: a quadratic y = c0 + c1·t + c2·t² over the window; the window is
 *   linear when the rate changes across it by less than `tolerance` (default 10 %) of the mean
 *   rate, or when that change is within 2 standard errors of zero (indistinguishable from noise).
 * - Window: the longest linear window from the first read (or, after a lag or a burst, from the
 *   first read of the steady phase), at least `minPoints` reads long.
 * - Progress shape over the whole read: "depletion" (rate falls, e.g. substrate depletion or
 *   product inhibition), "lag" (rate rises, e.g. slow activation or coupled-assay lag), "burst"
 *   (a fast first phase then a linear one), or "linear".
 */

export interface InitialRateOptions {
  /** Smallest window, in reads (default 4, at least 3). */
  minPoints?: number;
  /** Largest accepted relative change of the rate across the window (default 0.1). */
  tolerance?: number;
}

export type ProgressShape = "linear" | "depletion" | "lag" | "burst";

export interface InitialRate {
  /** Signal units per time unit. */
  slope: number;
  intercept: number;
  slopeSe: number | null;
  rSquared: number | null;
  /** Indices (inclusive) into the time-sorted reads. */
  windowStart: number;
  windowEnd: number;
  startTime: number;
  endTime: number;
  nPoints: number;
  progress: ProgressShape;
  /** True when the progress curve is not linear over the whole read. */
  curved: boolean;
}

interface Line {
  slope: number;
  intercept: number;
  slopeSe: number | null;
  rSquared: number | null;
}

function lineFit(t: Float64Array, y: Float64Array, from: number, to: number): Line {
  const n = to - from + 1;
  let st = 0;
  let sy = 0;
  for (let k = from; k <= to; k++) {
    st += t[k]!;
    sy += y[k]!;
  }
  const mt = st / n;
  const my = sy / n;
  let stt = 0;
  let sty = 0;
  let syy = 0;
  for (let k = from; k <= to; k++) {
    const dt = t[k]! - mt;
    const dy = y[k]! - my;
    stt += dt * dt;
    sty += dt * dy;
    syy += dy * dy;
  }
  const slope = sty / stt;
  const intercept = my - slope * mt;
  const rss = Math.max(0, syy - slope * sty);
  return {
    slope,
    intercept,
    slopeSe: n > 2 ? Math.sqrt(rss / (n - 2) / stt) : null,
    rSquared: syy > 0 ? 1 - rss / syy : null,
  };
}

/** Relative change of the rate across [from, to] from a quadratic fit, and its SE. */
function rateChange(
  t: Float64Array,
  y: Float64Array,
  from: number,
  to: number,
): { change: number; se: number; meanRate: number } {
  const n = to - from + 1;
  // Centre and scale time for conditioning.
  const t0 = t[from]!;
  const span = t[to]! - t0;
  const u = new Float64Array(n);
  const v = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    u[k] = (t[from + k]! - t0) / span - 0.5;
    v[k] = y[from + k]!;
  }
  // Normal equations of [1, u, u²] (3×3), solved by Cramer's rule on the symmetric system.
  let s0 = 0,
    s1 = 0,
    s2 = 0,
    s3 = 0,
    s4 = 0,
    b0 = 0,
    b1 = 0,
    b2 = 0;
  for (let k = 0; k < n; k++) {
    const uk = u[k]!;
    const u2 = uk * uk;
    s0 += 1;
    s1 += uk;
    s2 += u2;
    s3 += u2 * uk;
    s4 += u2 * u2;
    b0 += v[k]!;
    b1 += uk * v[k]!;
    b2 += u2 * v[k]!;
  }
  const m = [s0, s1, s2, s1, s2, s3, s2, s3, s4];
  const det3 = (q: number[]): number =>
    q[0]! * (q[4]! * q[8]! - q[5]! * q[7]!) -
    q[1]! * (q[3]! * q[8]! - q[5]! * q[6]!) +
    q[2]! * (q[3]! * q[7]! - q[4]! * q[6]!);
  const d = det3(m);
  const c1 = det3([s0, b0, s2, s1, b1, s3, s2, b2, s4]) / d;
  const c2 = det3([s0, s1, b0, s1, s2, b1, s2, s3, b2]) / d;
  const c0 = det3([b0, s1, s2, b1, s2, s3, b2, s3, s4]) / d;
  let rss = 0;
  for (let k = 0; k < n; k++) rss += (v[k]! - (c0 + c1 * u[k]! + c2 * u[k]! * u[k]!)) ** 2;
  // Var(c2) = σ²·[(XᵀX)⁻¹]₃₃ = σ²·(s0·s2 − s1²)/det
  const varC2 = n > 3 ? (rss / (n - 3)) * ((s0 * s2 - s1 * s1) / d) : Infinity;
  // Rate (in u units) goes from c1 − c2 to c1 + c2 over the window: change 2·c2 relative to c1.
  const meanRate = c1;
  return { change: (2 * c2) / Math.abs(c1), se: (2 * Math.sqrt(Math.max(0, varC2))) / Math.abs(c1), meanRate };
}

function isLinear(t: Float64Array, y: Float64Array, from: number, to: number, tolerance: number): boolean {
  if (to - from + 1 < 4) return true;
  const r = rateChange(t, y, from, to);
  if (!Number.isFinite(r.change)) return r.meanRate !== 0 ? false : true;
  return Math.abs(r.change) <= tolerance || Math.abs(r.change) <= 2 * r.se;
}

/**
 * Initial rate of one kinetic read. `time` need not be sorted; reads are sorted by time first.
 * Throws on fewer than `minPoints` reads, non-finite values or repeated times.
 */
export function initialRate(
  time: ArrayLike<number>,
  signal: ArrayLike<number>,
  options: InitialRateOptions = {},
): InitialRate {
  const minPoints = Math.max(3, options.minPoints ?? 4);
  const tolerance = options.tolerance ?? 0.1;
  const n = time.length;
  if (signal.length !== n) throw new RangeError("initialRate: time and signal must have the same length");
  if (n < minPoints) throw new RangeError(`initialRate: ${n} reads; at least ${minPoints} are needed`);
  const order = Array.from({ length: n }, (_, k) => k);
  for (let k = 0; k < n; k++) {
    if (!Number.isFinite(time[k]!) || !Number.isFinite(signal[k]!))
      throw new RangeError(`initialRate: read ${k + 1} is not finite`);
  }
  order.sort((a, b) => time[a]! - time[b]! || a - b);
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  order.forEach((src, k) => {
    t[k] = time[src]!;
    y[k] = signal[src]!;
  });
  for (let k = 1; k < n; k++) if (t[k] === t[k - 1]) throw new RangeError(`initialRate: time ${t[k]} appears twice`);

  // Shape of the whole read.
  let progress: ProgressShape = "linear";
  let start = 0;
  if (n >= 5 && !isLinear(t, y, 0, n - 1, tolerance)) {
    const whole = rateChange(t, y, 0, n - 1);
    // Burst: a fast first phase, then linear.
    const rest = Math.min(2, n - 4);
    const tail = rest > 0 ? lineFit(t, y, rest, n - 1) : null;
    const head = lineFit(t, y, 0, Math.min(rest, n - 1));
    if (
      tail &&
      Math.sign(head.slope) === Math.sign(tail.slope) &&
      Math.abs(head.slope) > 2 * Math.abs(tail.slope) &&
      isLinear(t, y, rest, n - 1, tolerance)
    ) {
      progress = "burst";
      start = rest;
    } else if (whole.change < 0) {
      progress = "depletion";
    } else {
      progress = "lag";
      // Start the window where the steady phase begins: the first start from which the
      // remaining reads (at least minPoints) are linear.
      start = n - minPoints;
      for (let s = 1; s <= n - minPoints; s++) {
        if (isLinear(t, y, s, n - 1, tolerance)) {
          start = s;
          break;
        }
      }
    }
  }
  // A read that is linear as a whole is used whole; otherwise grow the window until it curves.
  let end = progress === "linear" ? n - 1 : Math.min(n - 1, start + minPoints - 1);
  for (let e = end + 1; e < n; e++) {
    if (!isLinear(t, y, start, e, tolerance)) break;
    end = e;
  }
  const line = lineFit(t, y, start, end);
  return {
    slope: line.slope,
    intercept: line.intercept,
    slopeSe: line.slopeSe,
    rSquared: line.rSquared,
    windowStart: start,
    windowEnd: end,
    startTime: t[start]!,
    endTime: t[end]!,
    nPoints: end - start + 1,
    progress,
    curved: progress !== "linear",
  };
}
