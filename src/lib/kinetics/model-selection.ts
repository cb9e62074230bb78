/**
 * Model comparison: AICc, Akaike weights and the extra-sum-of-squares F-test for nested
 * least-squares models.
 *
 * - AICc = n·ln(RSS/n) + 2K + 2K(K+1)/(n − K − 1), K = fitted parameters + 1 (the variance).
 *   Burnham & Anderson, Model Selection and Multimodel Inference, 2nd ed. 2002, eq. 2.14 and
 *   §2.2 for least squares [from memory].
 * - Akaike weight w_i = exp(−Δ_i/2)/Σ_j exp(−Δ_j/2), Δ_i = AICc_i − min AICc (ibid. §2.9).
 * - F = ((RSS_s − RSS_c)/(df_s − df_c)) / (RSS_c/df_c), p = P(F_{df_s−df_c, df_c} > F), for a
 *   simpler model s nested in a more complex model c (Bates & Watts 1988, §3.10; Motulsky &
 *   Christopoulos, Fitting Models to Biological Data, 2004, ch. 22 [from memory]).
 */
import { fSurvival } from "./distributions";

/**
 * Corrected Akaike information criterion for a least-squares fit with `nParams` fitted
 * parameters (K = nParams + 1). Returns +Infinity when n − K − 1 ≤ 0 (undefined).
 */
export function aicc(rss: number, n: number, nParams: number): number {
  const k = nParams + 1;
  if (n - k - 1 <= 0) return Infinity;
  return n * Math.log(rss / n) + 2 * k + (2 * k * (k + 1)) / (n - k - 1);
}

/** Akaike weights of a set of AICc values (non-finite values get weight 0). */
export function akaikeWeights(values: readonly number[]): number[] {
  let min = Infinity;
  for (const v of values) if (Number.isFinite(v) && v < min) min = v;
  if (min === Infinity) return values.map(() => 0);
  const raw = values.map((v) => (Number.isFinite(v) ? Math.exp(-(v - min) / 2) : 0));
  const total = raw.reduce((s, v) => s + v, 0);
  return raw.map((v) => v / total);
}

export interface FTestResult {
  f: number;
  p: number;
  dfNumerator: number;
  dfDenominator: number;
}

/**
 * Extra-sum-of-squares F-test of a simpler model (rssSimple, dfSimple = n − p_s) against the
 * more complex model it is nested in (rssComplex, dfComplex = n − p_c). When the complex model
 * fits no better (RSS_c ≥ RSS_s) F = 0 and p = 1.
 * Example: DNase run 1, 3- vs 4-parameter logistic → F 0.2098, p 0.6551 (computed with SciPy).
 */
export function extraSumOfSquaresFTest(
  rssSimple: number,
  dfSimple: number,
  rssComplex: number,
  dfComplex: number,
): FTestResult {
  const dfNumerator = dfSimple - dfComplex;
  if (!(dfNumerator > 0) || !(dfComplex > 0))
    throw new RangeError("extraSumOfSquaresFTest: need dfSimple > dfComplex > 0");
  if (!(rssComplex < rssSimple)) return { f: 0, p: 1, dfNumerator, dfDenominator: dfComplex };
  if (rssComplex <= 0) return { f: Infinity, p: 0, dfNumerator, dfDenominator: dfComplex };
  const f = (rssSimple - rssComplex) / dfNumerator / (rssComplex / dfComplex);
  return { f, p: fSurvival(f, dfNumerator, dfComplex), dfNumerator, dfDenominator: dfComplex };
}
