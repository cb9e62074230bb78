/**
 * Plate quality from control wells: summary statistics of a control group, Z′-factor,
 * signal-to-background, signal window, and robust (median/MAD) variants.
 *
 * - Mean, SD with n − 1, CV = 100·SD/mean (simple-statistics).
 * - Z′ = 1 − 3(σ₊ + σ₋)/|μ₊ − μ₋| (Zhang, Chung & Oldenburg, J Biomol Screen 1999;4:67–73).
 *   Z′ ≥ 0.5 is an excellent assay (IUPAC Gold Book); acceptance at Z′ ≥ 0.4 or SW ≥ 2 with
 *   control CV ≤ 20 % (NIH Assay Guidance Manual, HTS Assay Validation [from memory]).
 * - S/B = μmax/μmin; SW = (|μmax − μmin| − 3(σmax + σmin))/σmax (Assay Guidance Manual
 *   [from memory]), where "max" is the control group with the higher mean.
 * - Robust variants replace mean by median and SD by 1.4826·MAD (the consistency factor for
 *   normal data; Rousseeuw & Croux, JASA 1993;88:1273 [from memory]).
 * Example (worked check, values computed with SciPy): neutral 950, 1010, 1040, 980, 1020, 1000; full inhibition
 * 90, 110, 95, 105, 100, 100 → Z′ 0.87102, SW 24.79, S/B 10, CV 3.16 % and 7.07 %.
 */
import { mean, median, medianAbsoluteDeviation, sampleStandardDeviation } from "simple-statistics";

/** 1.4826 ≈ 1/Φ⁻¹(3/4): MAD × this estimates σ for normal data. */
export const MAD_TO_SD = 1.482602218505602;

export interface ControlSummary {
  n: number;
  mean: number;
  /** Sample SD (n − 1); null for n < 2. */
  sd: number | null;
  /** CV in percent (100·SD/|mean|); null when undefined. */
  cvPercent: number | null;
  median: number;
  /** Raw median absolute deviation (not scaled). */
  mad: number;
  /** 1.4826·MAD. */
  robustSd: number;
  /** 100·robustSd/|median|; null when undefined. */
  robustCvPercent: number | null;
}

function finiteValues(name: string, values: readonly number[]): readonly number[] {
  if (values.length === 0) throw new RangeError(`${name}: no values`);
  values.forEach((v, k) => {
    if (!Number.isFinite(v)) throw new RangeError(`${name}: value ${k + 1} is not a finite number (${v})`);
  });
  return values;
}

/** Mean, SD (n − 1), CV and robust counterparts of one control group. */
export function summarizeControls(values: readonly number[]): ControlSummary {
  const v = finiteValues("summarizeControls", values) as number[];
  const m = mean(v);
  const sd = v.length >= 2 ? sampleStandardDeviation(v) : null;
  const med = median(v);
  const mad = medianAbsoluteDeviation(v);
  const robustSd = MAD_TO_SD * mad;
  return {
    n: v.length,
    mean: m,
    sd,
    cvPercent: sd !== null && m !== 0 ? (100 * sd) / Math.abs(m) : null,
    median: med,
    mad,
    robustSd,
    robustCvPercent: med !== 0 ? (100 * robustSd) / Math.abs(med) : null,
  };
}

/** Z′ = 1 − 3(σ₁ + σ₂)/|μ₁ − μ₂| from two control groups' means and SDs. Null if μ₁ = μ₂. */
export function zPrimeFromMoments(mean1: number, sd1: number, mean2: number, sd2: number): number | null {
  const gap = Math.abs(mean1 - mean2);
  return gap > 0 ? 1 - (3 * (sd1 + sd2)) / gap : null;
}

/** SW = (|μmax − μmin| − 3(σmax + σmin))/σmax, "max" being the group with the higher mean. */
export function signalWindowFromMoments(mean1: number, sd1: number, mean2: number, sd2: number): number | null {
  const [sdMax, sdMin] = mean1 >= mean2 ? [sd1, sd2] : [sd2, sd1];
  return sdMax > 0 ? (Math.abs(mean1 - mean2) - 3 * (sdMax + sdMin)) / sdMax : null;
}

/**
 * Z-factor of sample wells against a control group: Z = 1 − 3(σs + σc)/|μs − μc| (Zhang, Chung &
 * Oldenburg 1999 — Z′ uses two control groups, Z uses the samples). Null when the means are equal
 * or a group has fewer than 2 wells.
 */
export function zFactor(samples: readonly number[], control: readonly number[]): number | null {
  const s = summarizeControls(samples);
  const c = summarizeControls(control);
  if (s.sd === null || c.sd === null) return null;
  return zPrimeFromMoments(s.mean, s.sd, c.mean, c.sd);
}

export interface PlateQuality {
  neutral: ControlSummary;
  fullInhibition: ControlSummary;
  zPrime: number | null;
  /** Z′ with median and 1.4826·MAD. */
  robustZPrime: number | null;
  /** μmax/μmin (null when μmin is 0). */
  signalToBackground: number | null;
  signalWindow: number | null;
}

/**
 * Quality of a plate from its neutral (no inhibition, e.g. DMSO) and full-inhibition control
 * wells. Needs at least two wells in each group.
 */
export function plateQuality(neutral: readonly number[], fullInhibition: readonly number[]): PlateQuality {
  const a = summarizeControls(neutral);
  const b = summarizeControls(fullInhibition);
  if (a.sd === null || b.sd === null) throw new RangeError("plateQuality: each control group needs at least 2 wells");
  const hi = a.mean >= b.mean ? a.mean : b.mean;
  const lo = a.mean >= b.mean ? b.mean : a.mean;
  return {
    neutral: a,
    fullInhibition: b,
    zPrime: zPrimeFromMoments(a.mean, a.sd, b.mean, b.sd),
    robustZPrime: zPrimeFromMoments(a.median, a.robustSd, b.median, b.robustSd),
    signalToBackground: lo !== 0 ? hi / lo : null,
    signalWindow: signalWindowFromMoments(a.mean, a.sd, b.mean, b.sd),
  };
}
