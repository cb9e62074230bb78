/**
 * Turning a fitted parameter and its standard error into what a report shows: Wald 95 % CIs with
 * the t quantile, and the reciprocal transform used for inhibition constants (K = 1/a).
 * Delta method: SE(1/a) = SE(a)/a² (e.g. Bates & Watts 1988, §2.3.1; Seber & Wild, Nonlinear
 * Regression, 1989, §1.2 [from memory]).
 */
import { tCritical95 } from "./distributions";

export type Interval = [number | null, number | null];

/** Replaces non-finite numbers with null, so that results serialise to JSON without NaN. */
export function finiteOrNull(v: number | null | undefined): number | null {
  return v !== null && v !== undefined && Number.isFinite(v) ? v : null;
}

/** θ ± t(0.975, dof)·SE, or [null, null] when the SE is unknown. */
export function waldInterval95(value: number, se: number | null, dof: number): Interval {
  if (se === null || !(dof > 0) || !Number.isFinite(value)) return [null, null];
  const half = tCritical95(dof) * se;
  return [finiteOrNull(value - half), finiteOrNull(value + half)];
}

/**
 * Inhibition constant K = 1/a from a fitted a ≥ 0, with SE by the delta method and the 95 % CI
 * obtained by inverting the CI of a (so it stays positive, and an end is null = unbounded where
 * the CI of a reaches 0). a = 0 (the boundary) gives K = null (infinite) and SE null.
 */
export function reciprocalConstant(
  a: number,
  seA: number | null,
  dof: number,
): { value: number | null; se: number | null; ci95: Interval } {
  if (!(a > 0) || !Number.isFinite(a)) {
    const [, aHi] = waldInterval95(a, seA, dof);
    return { value: null, se: null, ci95: [aHi !== null && aHi > 0 ? 1 / aHi : null, null] };
  }
  const value = 1 / a;
  const se = seA === null ? null : seA / (a * a);
  const [aLo, aHi] = waldInterval95(a, seA, dof);
  const lo = aHi !== null && aHi > 0 ? 1 / aHi : null;
  const hi = aLo !== null && aLo > 0 ? 1 / aLo : null;
  return { value: finiteOrNull(value), se: finiteOrNull(se), ci95: [finiteOrNull(lo), finiteOrNull(hi)] };
}
