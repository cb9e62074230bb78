/**
 * Distribution functions needed for confidence intervals and the extra-sum-of-squares F-test:
 * the regularized incomplete beta function, the Student t CDF and quantile, and the F CDF.
 *
 * simple-statistics 7 has ln Γ (used here) but no incomplete beta, t quantile or F CDF, so they are
 * implemented with the standard algorithms:
 * - I_x(a, b) by the modified Lentz continued fraction (Press, Teukolsky, Vetterling & Flannery,
 *   Numerical Recipes, 3rd ed. 2007, §6.4; Abramowitz & Stegun 26.5.8).
 * - Its inverse by Halley's method from the NR §6.4 (invbetai) starting guess, with a bisection
 *   safeguard.
 * - t CDF: P(T ≤ t) = 1 − ½·I_{ν/(ν+t²)}(ν/2, ½) for t > 0 (A&S 26.7.1 via 26.5.27).
 * - F CDF: P(F ≤ f) = I_{d1·f/(d1·f+d2)}(d1/2, d2/2) (A&S 26.6.2).
 * Checked against scipy.special / scipy.stats in distributions.test.ts.
 */
import { gammaln } from "simple-statistics";

const EPS = 1e-16;
const FPMIN = 1e-300;

/** Continued fraction for I_x(a,b) (Numerical Recipes 3rd ed. §6.4, modified Lentz). */
function betaContinuedFraction(a: number, b: number, x: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < FPMIN) d = FPMIN;
  d = 1 / d;
  let h = d;
  const maxIter = 10_000 + Math.ceil(20 * Math.sqrt(Math.max(a, b)));
  for (let m = 1; m <= maxIter; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < FPMIN) d = FPMIN;
    c = 1 + aa / c;
    if (Math.abs(c) < FPMIN) c = FPMIN;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < FPMIN) d = FPMIN;
    c = 1 + aa / c;
    if (Math.abs(c) < FPMIN) c = FPMIN;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) <= EPS) break;
  }
  return h;
}

/**
 * Regularized incomplete beta function I_x(a, b) = B(x; a, b) / B(a, b), for a, b > 0 and
 * 0 ≤ x ≤ 1. Numerical Recipes 3rd ed. §6.4 (betai); Abramowitz & Stegun 26.5.8.
 * Example: regularizedIncompleteBeta(0.5, 2, 3) = 0.6875.
 */
export function regularizedIncompleteBeta(x: number, a: number, b: number): number {
  if (!(a > 0) || !(b > 0) || !(x >= 0) || !(x <= 1)) {
    throw new RangeError(`regularizedIncompleteBeta: need a > 0, b > 0, 0 ≤ x ≤ 1 (got x=${x}, a=${a}, b=${b})`);
  }
  if (x === 0) return 0;
  if (x === 1) return 1;
  const lnFront = gammaln(a + b) - gammaln(a) - gammaln(b) + a * Math.log(x) + b * Math.log1p(-x);
  const front = Math.exp(lnFront);
  if (x < (a + 1) / (a + b + 2)) return (front * betaContinuedFraction(a, b, x)) / a;
  return 1 - (front * betaContinuedFraction(b, a, 1 - x)) / b;
}

/**
 * Inverse of I_x(a, b) in x: the x with I_x(a, b) = p. Halley iteration from the starting guess of
 * Numerical Recipes 3rd ed. §6.4 (invbetai), safeguarded by bisection so it always converges.
 */
export function inverseRegularizedIncompleteBeta(p: number, a: number, b: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`inverseRegularizedIncompleteBeta: p must be in [0, 1] (got ${p})`);
  if (p === 0) return 0;
  if (p === 1) return 1;
  const a1 = a - 1;
  const b1 = b - 1;
  let x: number;
  if (a >= 1 && b >= 1) {
    const pp = p < 0.5 ? p : 1 - p;
    const t = Math.sqrt(-2 * Math.log(pp));
    let z = (2.30753 + t * 0.27061) / (1 + t * (0.99229 + t * 0.04481)) - t;
    if (p < 0.5) z = -z;
    const al = (z * z - 3) / 6;
    const h = 2 / (1 / (2 * a - 1) + 1 / (2 * b - 1));
    const w = (z * Math.sqrt(al + h)) / h - (1 / (2 * b - 1) - 1 / (2 * a - 1)) * (al + 5 / 6 - 2 / (3 * h));
    x = a / (a + b * Math.exp(2 * w));
  } else {
    const lna = Math.log(a / (a + b));
    const lnb = Math.log(b / (a + b));
    const t = Math.exp(a * lna) / a;
    const u = Math.exp(b * lnb) / b;
    const w = t + u;
    x = p < t / w ? Math.pow(a * w * p, 1 / a) : 1 - Math.pow(b * w * (1 - p), 1 / b);
  }
  const afac = -gammaln(a) - gammaln(b) + gammaln(a + b);
  // Bracket kept up to date so that a wild Halley step falls back to bisection.
  let lo = 0;
  let hi = 1;
  for (let j = 0; j < 100; j++) {
    if (!(x > lo && x < hi)) x = 0.5 * (lo + hi);
    const err = regularizedIncompleteBeta(x, a, b) - p;
    if (err === 0) return x;
    if (err < 0) lo = x;
    else hi = x;
    const density = Math.exp(a1 * Math.log(x) + b1 * Math.log1p(-x) + afac);
    const u = err / density;
    const step = u / (1 - 0.5 * Math.min(1, u * (a1 / x - b1 / (1 - x))));
    const next = x - step;
    if (Math.abs(step) <= 1e-15 * x || hi - lo <= 1e-16 * x) return next > lo && next < hi ? next : x;
    x = next;
  }
  return x;
}

/** Student t CDF P(T ≤ t) with ν degrees of freedom (A&S 26.7.1 through 26.5.27). */
export function studentTCdf(t: number, df: number): number {
  if (!(df > 0)) throw new RangeError(`studentTCdf: degrees of freedom must be > 0 (got ${df})`);
  if (t === Infinity) return 1;
  if (t === -Infinity) return 0;
  const tail = 0.5 * regularizedIncompleteBeta(df / (df + t * t), df / 2, 0.5);
  return t > 0 ? 1 - tail : tail;
}

/**
 * Student t quantile: the t with P(T ≤ t) = p for ν degrees of freedom, by inverting the
 * incomplete beta relation above. Example: studentTQuantile(0.975, 12) = 2.1788128 (SciPy
 * stats.t.ppf).
 */
export function studentTQuantile(p: number, df: number): number {
  if (!(df > 0)) throw new RangeError(`studentTQuantile: degrees of freedom must be > 0 (got ${df})`);
  if (!(p > 0 && p < 1)) {
    if (p === 0) return -Infinity;
    if (p === 1) return Infinity;
    throw new RangeError(`studentTQuantile: p must be in [0, 1] (got ${p})`);
  }
  if (p === 0.5) return 0;
  const tail = p < 0.5 ? p : 1 - p;
  const x = inverseRegularizedIncompleteBeta(2 * tail, df / 2, 0.5);
  const t = Math.sqrt((df * (1 - x)) / x);
  return p < 0.5 ? -t : t;
}

const t975Cache = new Map<number, number>();

/** t(0.975, ν): the two-sided 95 % critical value, cached per ν because fits ask for it often. */
export function tCritical95(df: number): number {
  let v = t975Cache.get(df);
  if (v === undefined) {
    v = studentTQuantile(0.975, df);
    if (t975Cache.size < 10_000) t975Cache.set(df, v);
  }
  return v;
}

/** F distribution CDF P(F ≤ f) with (d1, d2) degrees of freedom (A&S 26.6.2). */
export function fCdf(f: number, d1: number, d2: number): number {
  if (!(d1 > 0) || !(d2 > 0)) throw new RangeError(`fCdf: degrees of freedom must be > 0 (got ${d1}, ${d2})`);
  if (!(f > 0)) return 0;
  if (f === Infinity) return 1;
  return regularizedIncompleteBeta((d1 * f) / (d1 * f + d2), d1 / 2, d2 / 2);
}

/**
 * Upper tail P(F > f), computed directly as I_{d2/(d2+d1·f)}(d2/2, d1/2) so that small p values
 * keep their precision (A&S 26.6.2 with the symmetry I_x(a,b) = 1 − I_{1−x}(b,a)).
 */
export function fSurvival(f: number, d1: number, d2: number): number {
  if (!(d1 > 0) || !(d2 > 0)) throw new RangeError(`fSurvival: degrees of freedom must be > 0 (got ${d1}, ${d2})`);
  if (!(f > 0)) return 1;
  if (f === Infinity) return 0;
  return regularizedIncompleteBeta(d2 / (d2 + d1 * f), d2 / 2, d1 / 2);
}
