/**
 * Hit calling for single-concentration screens (common practice):
 * - a fixed % inhibition threshold (typically 30–50 %);
 * - a statistical cut-off at mean + k·SD of the neutral controls' % inhibition (k = 3 gives
 *   0.135 % one-sided false positives under normality);
 * - the robust version median + k·1.4826·MAD, less sensitive to outlying control wells.
 * A well is a hit when its % inhibition is at or above the threshold.
 */
import { mean, median, medianAbsoluteDeviation, sampleStandardDeviation } from "simple-statistics";
import { MAD_TO_SD } from "./plate-statistics";

export type HitRule =
  { kind: "percent"; thresholdPercent: number } | { kind: "sd"; k: number } | { kind: "robust"; k: number };

export interface HitCall {
  /** The % inhibition cut-off applied. */
  threshold: number;
  /** One boolean per sample, in input order. */
  isHit: boolean[];
  hitCount: number;
}

/**
 * Calls hits among `samplePercentInhibition` under `rule`. For the "sd" and "robust" rules,
 * `neutralPercentInhibition` are the neutral controls expressed as % inhibition (≥ 2 wells).
 */
export function callHits(
  samplePercentInhibition: readonly number[],
  rule: HitRule,
  neutralPercentInhibition: readonly number[] = [],
): HitCall {
  let threshold: number;
  if (rule.kind === "percent") {
    threshold = rule.thresholdPercent;
  } else {
    const c = neutralPercentInhibition as number[];
    if (c.length < 2) throw new RangeError("callHits: the mean + k·SD rules need at least 2 neutral control wells");
    if (!(rule.k >= 0)) throw new RangeError("callHits: k must be ≥ 0");
    threshold =
      rule.kind === "sd"
        ? mean(c) + rule.k * sampleStandardDeviation(c)
        : median(c) + rule.k * MAD_TO_SD * medianAbsoluteDeviation(c);
  }
  if (!Number.isFinite(threshold)) throw new RangeError("callHits: threshold must be finite");
  const isHit = samplePercentInhibition.map((x) => Number.isFinite(x) && x >= threshold);
  return { threshold, isHit, hitCount: isHit.filter(Boolean).length };
}
