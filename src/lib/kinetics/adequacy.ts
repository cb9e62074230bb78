/**
 * Is the fitted model adequate? Two checks that do not depend on which model was chosen.
 *
 * - Lack-of-fit F-test (Draper & Smith, Applied Regression Analysis, ch. 2; Bates & Watts 1988
 *   [from memory]). With replicate observations at g distinct conditions, the residual sum of
 *   squares splits into pure error SSpe = Σ (y − ȳ_group)² (df n − g) and lack of fit
 *   RSS − SSpe (df g − p):  F = ((RSS − SSpe)/(g − p)) / (SSpe/(n − g)), p = P(F_{g−p, n−g} > F).
 *   A small p says the model misses a systematic pattern. Needs g > p and n > g. Weighted fits
 *   pass weighted residuals and weighted observations (w·y), so both sums use the same scale.
 * - Wald–Wolfowitz runs test on the signs of the residuals in their natural order (by [S], then
 *   [I]; by dose): too few runs means the residuals are clustered, a systematic misfit
 *   (Motulsky & Christopoulos, Fitting Models to Biological Data, 2004 [from memory]). With n₊
 *   positive and n₋ negative residuals, E[R] = 1 + 2n₊n₋/n and
 *   Var[R] = 2n₊n₋(2n₊n₋ − n)/(n²(n − 1)); one-sided p = P(R ≤ observed). Exact by enumeration
 *   of the run-count distribution for n ≤ 60 (small samples are the common case), normal
 *   approximation with continuity correction above. Zero residuals are left out.
 */
import { fSurvival } from "./distributions";

export interface LackOfFit {
  f: number;
  p: number;
  dfLof: number;
  dfPe: number;
}

export interface RunsTest {
  runs: number;
  expected: number;
  p: number;
}

export interface Adequacy {
  lackOfFit: LackOfFit | null;
  runs: RunsTest;
}

/** p below this fails adequacy: the result is labelled `inadequate` (common practice: 0.01). */
export const ADEQUACY_ALPHA = 0.01;

/**
 * Lack-of-fit F-test. `keys[k]` names the condition of observation k (replicates share a key);
 * `observed[k]` and `residual[k]` are on the fit's own (weighted) scale; `nParams` fitted
 * parameters. Null when there are no replicates (n = g) or too few conditions (g ≤ p).
 */
export function lackOfFitTest(
  keys: readonly string[],
  observed: ArrayLike<number>,
  residual: ArrayLike<number>,
  nParams: number,
): LackOfFit | null {
  const n = keys.length;
  const groups = new Map<string, number[]>();
  keys.forEach((key, k) => {
    const g = groups.get(key);
    if (g) g.push(k);
    else groups.set(key, [k]);
  });
  const g = groups.size;
  const dfPe = n - g;
  const dfLof = g - nParams;
  if (dfPe <= 0 || dfLof <= 0) return null;
  let rss = 0;
  for (let k = 0; k < n; k++) rss += residual[k]! ** 2;
  let sspe = 0;
  for (const idx of groups.values()) {
    if (idx.length < 2) continue;
    let mean = 0;
    for (const k of idx) mean += observed[k]!;
    mean /= idx.length;
    for (const k of idx) sspe += (observed[k]! - mean) ** 2;
  }
  const sslof = Math.max(0, rss - sspe);
  if (!(sspe > 0)) return sslof > 0 ? { f: Infinity, p: 0, dfLof, dfPe } : { f: 0, p: 1, dfLof, dfPe };
  const f = sslof / dfLof / (sspe / dfPe);
  return { f, p: fSurvival(f, dfLof, dfPe), dfLof, dfPe };
}

/** ln C(n, k) */
function lnChoose(n: number, k: number): number {
  let s = 0;
  for (let j = 1; j <= k; j++) s += Math.log(n - k + j) - Math.log(j);
  return s;
}

/** P(R = r) for the number of runs of n1 and n2 signs in random order (exact). */
function runsPmf(r: number, n1: number, n2: number, lnTotal: number): number {
  if (r < 2) return 0;
  if (r % 2 === 0) {
    const k = r / 2;
    if (k - 1 > n1 - 1 || k - 1 > n2 - 1) return 0;
    return 2 * Math.exp(lnChoose(n1 - 1, k - 1) + lnChoose(n2 - 1, k - 1) - lnTotal);
  }
  const k = (r - 1) / 2;
  let p = 0;
  if (k <= n1 - 1 && k - 1 <= n2 - 1 && k - 1 >= 0)
    p += Math.exp(lnChoose(n1 - 1, k) + lnChoose(n2 - 1, k - 1) - lnTotal);
  if (k <= n2 - 1 && k - 1 <= n1 - 1 && k - 1 >= 0)
    p += Math.exp(lnChoose(n1 - 1, k - 1) + lnChoose(n2 - 1, k) - lnTotal);
  return p;
}

function normalCdf(z: number): number {
  // Abramowitz & Stegun 7.1.26 via erf; |error| < 1.5e-7.
  const t = 1 / (1 + 0.3275911 * (Math.abs(z) / Math.SQRT2));
  const y =
    1 -
    ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) *
      t *
      Math.exp(-(z * z) / 2);
  return z >= 0 ? 0.5 * (1 + y) : 0.5 * (1 - y);
}

/**
 * Runs test of residuals already in their natural order. One-sided: p = P(R ≤ runs) under
 * random signs, so a small p means too few runs (clustered residuals). With fewer than two
 * signs of either kind p is 1 (nothing to judge).
 * Example: signs + + + − − − + + + − − − (4 runs of 12): expected 7, exact p = 0.0671 (by enumeration of all 924 orders).
 */
export function runsTest(residualsInOrder: ArrayLike<number>): RunsTest {
  const signs: number[] = [];
  for (let k = 0; k < residualsInOrder.length; k++) {
    const r = residualsInOrder[k]!;
    if (r > 0) signs.push(1);
    else if (r < 0) signs.push(-1);
  }
  const n1 = signs.filter((s) => s > 0).length;
  const n2 = signs.length - n1;
  const n = n1 + n2;
  let runs = n > 0 ? 1 : 0;
  for (let k = 1; k < n; k++) if (signs[k] !== signs[k - 1]) runs++;
  const expected = n > 0 ? 1 + (2 * n1 * n2) / n : 0;
  if (n1 < 2 || n2 < 2) return { runs, expected, p: 1 };
  let p: number;
  if (n <= 60) {
    const lnTotal = lnChoose(n, n1);
    p = 0;
    for (let r = 2; r <= runs; r++) p += runsPmf(r, n1, n2, lnTotal);
  } else {
    const v = (2 * n1 * n2 * (2 * n1 * n2 - n)) / (n * n * (n - 1));
    p = normalCdf((runs + 0.5 - expected) / Math.sqrt(v));
  }
  return { runs, expected, p: Math.min(1, Math.max(0, p)) };
}

/** Both checks, and whether either fails at ADEQUACY_ALPHA. */
export function assessAdequacy(
  keys: readonly string[],
  observed: ArrayLike<number>,
  residualsInOrder: ArrayLike<number>,
  nParams: number,
): Adequacy & { adequate: boolean; reasons: string[] } {
  const lackOfFit = lackOfFitTest(keys, observed, residualsInOrder, nParams);
  const runs = runsTest(residualsInOrder);
  const reasons: string[] = [];
  if (lackOfFit && lackOfFit.p < ADEQUACY_ALPHA)
    reasons.push(
      `lack of fit: replicates scatter less than the misfit (F ${lackOfFit.f.toPrecision(3)}, p ${lackOfFit.p.toPrecision(2)})`,
    );
  if (runs.p < ADEQUACY_ALPHA)
    reasons.push(
      `residual pattern: ${runs.runs} runs of signs where ${runs.expected.toFixed(1)} are expected (p ${runs.p.toPrecision(2)})`,
    );
  return { lackOfFit, runs, adequate: reasons.length === 0, reasons };
}
