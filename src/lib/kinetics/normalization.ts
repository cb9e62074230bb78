/**
 * Normalisation of sample wells against a plate's own controls (common practice; e.g. NIH Assay
 * Guidance Manual, "HTS Assay Validation" [from memory]):
 *
 *   % inhibition = 100·(μneutral − x)/(μneutral − μfull)
 *   % activity   = 100 − % inhibition
 *
 * Works for signals that fall (neutral high) or rise (neutral low) with inhibition.
 * Example: neutral mean 1000, full-inhibition mean 100, a well reading 550 → 50 %.
 */

/** % inhibition of reading x against the neutral and full-inhibition control means. */
export function percentInhibition(x: number, neutralMean: number, fullInhibitionMean: number): number {
  const span = neutralMean - fullInhibitionMean;
  if (!(span !== 0) || !Number.isFinite(span))
    throw new RangeError("percentInhibition: neutral and full-inhibition means must differ");
  return (100 * (neutralMean - x)) / span;
}

/** % activity = 100·(x − μfull)/(μneutral − μfull). */
export function percentActivity(x: number, neutralMean: number, fullInhibitionMean: number): number {
  return 100 - percentInhibition(x, neutralMean, fullInhibitionMean);
}
