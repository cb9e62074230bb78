/**
 * Dose-response judgement: a 4PL fit (logistic4.ts) wrapped in the checks a careful scientist
 * applies before reporting an IC50, so that a flat, weak, activating, stepped or outlier-bent
 * curve is never reported as a confident potency.
 *
 * Order of the checks (thresholds are common practice unless a source is named):
 * 1. Too few points (fewer than 5, or fewer than 4 distinct concentrations) → not determined.
 * 2. Weighting: "auto" chooses none or relative from the replicate scatter (weighting.ts);
 *    "none"/"relative" are used as set. The choice and its reason are reported.
 * 3. Outliers (ROUT, robust.ts): searched when `robust` is on, or when a cheap screen of the
 *    ordinary fit finds a residual beyond OUTLIER_SCREEN_T robust SDs; proposed wells are listed
 *    with their p-values. They stay in the reported fit unless `robust` is on; then the fit
 *    without them is reported and the all-points analysis is kept beside it (`alternative`).
 * 4. On a percent scale (% inhibition, or % activity read as 100 − activity):
 *    activator — inhibition below −max(20 %, 3·noise SD) at the top concentration (measured or
 *    fitted): the compound raises the activity; inactive — the maximum mean % inhibition and
 *    the fitted value at the top concentration both stay below 50 % (no IC50 within the range;
 *    the maximum is reported).
 *    At least 50 % at every concentration: the IC50 lies below the range → not determined.
 * 5. No dose-dependence (extra-sum-of-squares F-test of the 4PL against a flat line, p ≥ 0.05,
 *    Motulsky & Christopoulos 2004 [from memory]): on a raw signal scale that is "inactive"; on a
 *    percent scale that reached 50 % it is "not determined" (noise, not a curve).
 * 6. A step: Hill > STEP_HILL (5) means the whole transition lies between two tested
 *    concentrations, so the data fix only a bracket for the IC50 (reported as `ic50Bracket`),
 *    never a value: not determined (steep curves also point to aggregation or tight binding,
 *    Shoichet, J Med Chem 2006;49:7274 [from memory]).
 * 7. IC50 more than half a decade outside the tested range, a 95 % CI of the IC50 unbounded or
 *    wider than 1000-fold, or no convergence → not determined.
 * 8. Otherwise fitted, with the 4PL's flags plus: partial inhibition (fitted inhibition plateau
 *    below 80 % with the plateau reached: the ESI complex may still turn over, science.md),
 *    inadequate fit (lack-of-fit F-test across replicate doses or runs test by dose at p < 0.01,
 *    adequacy.ts), outliers proposed or excluded, relative weighting.
 * Results are for research use and need review by a qualified scientist.
 */
import { ADEQUACY_ALPHA, assessAdequacy, runsTest, type Adequacy, type RunsTest } from "./adequacy";
import { fSurvival } from "./distributions";
import {
  fitLogistic4,
  logistic4Fitted,
  logistic4Problem,
  logistic4Start,
  logistic4Theta,
  type Logistic4Fit,
  type Logistic4Flag,
  type Logistic4Options,
} from "./logistic4";
import { findOutliers, rsdr, DEFAULT_OUTLIER_Q } from "./robust";
import { chooseWeighting, concentrationKeys, relativeWeightFactors, scaleRows, type Weighting } from "./weighting";
import { MIN_DOSE_RESPONSE_CONCENTRATIONS, MIN_DOSE_RESPONSE_POINTS } from "./table-input";
import type { JudgementUnits } from "./mechanism-judgement";

export type CurveOutcome = "fitted" | "inactive" | "not-determined" | "activator";

/** What the responses are: % inhibition (0 = vehicle), % activity (100 = vehicle) or a raw signal. */
export type ResponseScale = "inhibition-pct" | "activity-pct" | "signal";

export type CurveFlag =
  | Logistic4Flag
  | "partial-inhibition"
  | "inadequate-fit"
  | "outliers-proposed"
  | "outliers-excluded"
  | "relative-weighting"
  | "steep-step";

export interface AnalyseCurveOptions {
  /** Default "auto". */
  weighting?: "auto" | Weighting;
  /** Search outliers and report the fit without them (default false: propose only). */
  robust?: boolean;
  /** False discovery rate of the outlier rule (default 1 %). */
  q?: number;
  /** Condition key of each point (replicates share a key); default the concentration. */
  keys?: readonly string[];
  /** Default "inhibition-pct". */
  response?: ResponseScale;
  fixedTop?: number;
  fixedBottom?: number;
  /**
   * Unit label the sentences attach to concentrations ("µM"); the engine is unit-agnostic, so
   * bare numbers by default. Only `concentration` is read (responses are % or the caller's signal).
   */
  units?: JudgementUnits;
  /** Name of each point for the sentences ("well C07"); by default points are not named. */
  rowNames?: readonly string[];
}

export interface CurveOutlier {
  index: number;
  x: number;
  y: number;
  /** Residual of the robust fit, on the fit's own (weighted) scale. */
  residual: number;
  /** Two-sided p of residual/RSDR (t on n − K df). */
  p: number;
}

export interface CurveJudgement {
  outcome: CurveOutcome;
  /** Why the outcome is not "fitted" (absent when fitted). */
  reason?: string;
  /** Largest mean % inhibition over the concentrations (percent scales only). */
  maxInhibitionPct?: number;
  /** For activators: the largest mean rise of activity above the vehicle, in %. */
  maxActivationPct?: number;
  /** For a step: the two tested concentrations the IC50 lies between. */
  ic50Bracket?: [number, number];
  /** The 4PL fit, null unless the outcome is "fitted". */
  fit: Logistic4Fit | null;
  adequacy: (Adequacy & { adequate: boolean; reasons: string[] }) | null;
  /** p of the F-test of the 4PL against a flat line (dose-dependence), when a fit exists. */
  doseEffectP: number | null;
  flags: CurveFlag[];
  /** Indices (into the caller's arrays) of the points behind this judgement. */
  usedIndices: number[];
}

export interface CurveAnalysis extends CurveJudgement {
  weighting: {
    used: Weighting;
    chosen: "auto" | "set";
    reason: string;
    slope?: number;
    p?: number;
  };
  outliers: CurveOutlier[];
  /** Which points the reported judgement uses. */
  reported: "all-points" | "outliers-excluded";
  /** The other judgement when outliers were proposed: without them (robust off) or with all points (robust on). */
  alternative: (CurveJudgement & { basis: "all-points" | "outliers-excluded" }) | null;
  /** Robust scale (RSDR) of the outlier search, when it ran. */
  robustScale: number | null;
}

/** Half a decade: how far beyond the tested range an IC50 may be extrapolated (common practice). */
const RANGE_SLACK_LOG10 = 0.5;
/** A 95 % CI of the IC50 wider than this ratio (3 decades) leaves the IC50 undetermined (our threshold). */
const MAX_CI_RATIO = 1000;
export const STEP_HILL = 5;
export const INACTIVE_BELOW_PCT = 50;
export const ACTIVATION_MIN_PCT = 20;
export const PARTIAL_BELOW_PCT = 80;
/** Screen: the outlier search runs when the ordinary fit has a residual beyond this many RSDRs. */
export const OUTLIER_SCREEN_T = 3;
const DOSE_EFFECT_ALPHA = 0.05;
/** Leave-one-out subsets fitted for the robust search (the best by their grid start). */
const LEAVE_OUT_FITS = 2;
/** A leave-one-out start is fitted only when dropping one point could cut the RSS below this fraction. */
const LEAVE_OUT_GAIN = 0.5;

interface Settings {
  weighting: Weighting;
  response: ResponseScale;
  /** " µM" (with its space) or "": appended to concentrations in sentences. */
  unit: string;
  fixedTop?: number;
  fixedBottom?: number;
}

/** A judgement with what the outlier search needs from it. */
interface Judged {
  judgement: CurveJudgement;
  fit: Logistic4Fit | null;
  /** Residuals on the fit's own scale (relative under relative weighting). */
  residuals: number[] | null;
  /** Residual multipliers of a relative fit (null when unweighted). */
  factors: Float64Array | null;
  /** Σ(y − ŷ)², unweighted, of the fit. */
  plainRss: number;
}

/**
 * Judges one dose-response series (see the file comment). `x` concentrations (≥ 0, any unit),
 * `y` responses on the `response` scale. Throws only on malformed input (lengths, non-finite
 * values, a key list of the wrong length, an unknown option); a series that cannot be fitted is
 * "not-determined".
 */
export function analyseCurve(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  options: AnalyseCurveOptions = {},
): CurveAnalysis {
  const n = x.length;
  if (y.length !== n) throw new RangeError(`analyseCurve: ${n} concentrations but ${y.length} responses`);
  // Filled by push: packed arrays (new Array(n) makes holey ones, measurably slower in the fit).
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < n; i++) {
    const xi = x[i]!;
    const yi = y[i]!;
    if (!Number.isFinite(xi) || xi < 0)
      throw new RangeError(`analyseCurve: concentration ${i + 1} must be a finite number ≥ 0 (got ${xi})`);
    if (!Number.isFinite(yi)) throw new RangeError(`analyseCurve: response ${i + 1} must be finite (got ${yi})`);
    xs.push(xi);
    ys.push(yi);
  }
  if (options.keys && options.keys.length !== n)
    throw new RangeError(`analyseCurve: ${options.keys.length} keys for ${n} points`);
  if (options.rowNames && options.rowNames.length !== n)
    throw new RangeError(`analyseCurve: ${options.rowNames.length} row names for ${n} points`);
  const requested = options.weighting ?? "auto";
  if (requested !== "auto" && requested !== "none" && requested !== "relative")
    throw new RangeError(`analyseCurve: weighting must be auto, none or relative (got ${String(requested)})`);
  const response = options.response ?? "inhibition-pct";
  if (response !== "inhibition-pct" && response !== "activity-pct" && response !== "signal")
    throw new RangeError(
      `analyseCurve: response must be inhibition-pct, activity-pct or signal (got ${String(response)})`,
    );
  const q = options.q ?? DEFAULT_OUTLIER_Q;
  if (!(q > 0 && q < 1)) throw new RangeError(`analyseCurve: q must be between 0 and 1 (got ${q})`);
  // Keys as strings only when there are replicates to group (the common single-well series skips it).
  const keys = options.keys ?? (countDistinct(xs) < n ? concentrationKeys(xs) : null);

  let weighting: CurveAnalysis["weighting"];
  if (requested !== "auto")
    weighting = { used: requested, chosen: "set", reason: `${requested} weighting as requested` };
  else if (keys === null)
    weighting = { used: "none", chosen: "auto", reason: "no replicate wells to judge the scatter by: unweighted" };
  else {
    const choice = autoWeighting(xs, ys, keys, response, options, q);
    weighting = { used: choice.weighting, chosen: "auto", reason: choice.reason };
    if (choice.slope !== undefined) weighting.slope = choice.slope;
    if (choice.p !== undefined) weighting.p = choice.p;
  }
  const settings = curveSettings(weighting.used, response, options);
  const all = indices(n);
  const core = judge(xs, ys, keys, all, settings);
  const base = { weighting, outliers: [] as CurveOutlier[], robustScale: null as number | null };
  const c = core.judgement;
  // Outlier search on the all-points fit: when asked; when the judgement is odd (an activator, not
  // determined, an inadequate or poor fit), since one wild well can cause each of these; or when the cheap
  // screen finds a residual far out. A clean fitted or inactive curve costs only the screen.
  const odd =
    c.outcome === "activator" ||
    (c.outcome === "not-determined" && !c.flags.includes("too-few-points")) ||
    (c.adequacy !== null && !c.adequacy.adequate) ||
    (c.fit !== null && c.fit.flags.includes("poor-fit"));
  if (core.fit && core.residuals && (options.robust || odd || screenSuggestsOutlier(core.residuals, core.fit))) {
    // Leave-one-out starts only where a wild well may have dragged the whole fit (asked, or an odd
    // judgement); when the screen alone fired, the outlier already stands out of the ordinary fit.
    const search = outlierSearch(xs, ys, core, settings, q, options.robust === true || odd);
    if (search) {
      base.robustScale = search.robustScale;
      base.outliers = search.outliers;
    }
  }
  if (base.outliers.length === 0) return assemble(c, base, "all-points", null);
  const excluded = new Set(base.outliers.map((o) => o.index));
  const without = judge(
    xs,
    ys,
    keys,
    all.filter((i) => !excluded.has(i)),
    settings,
  ).judgement;
  if (options.robust) {
    without.flags = [...without.flags, "outliers-excluded"];
    return assemble(without, base, "outliers-excluded", { ...c, basis: "all-points" });
  }
  c.flags = [...c.flags, "outliers-proposed"];
  if (c.outcome !== "fitted") {
    const one = base.outliers.length === 1;
    const named = options.rowNames
      ? ` (${pointsText(
          base.outliers.map((o) => o.index),
          options.rowNames,
        )})`
      : "";
    const wells = (one ? "the proposed outlier" : `the ${base.outliers.length} proposed outliers`) + named;
    const ic50 = without.fit?.ic50;
    const then =
      without.outcome === "fitted" && ic50
        ? `fitted, IC50 ${fmtC(ic50, settings.unit)}`
        : OUTCOME_WORDS[without.outcome];
    c.reason = `${c.reason}; without ${wells} the curve is ${then}`;
  }
  return assemble(c, base, "all-points", { ...without, basis: "outliers-excluded" });
}

function indices(n: number): number[] {
  const all: number[] = new Array<number>(n);
  for (let i = 0; i < n; i++) all[i] = i;
  return all;
}

function curveSettings(weighting: Weighting, response: Settings["response"], options: AnalyseCurveOptions): Settings {
  const unit = options.units?.concentration ? ` ${options.units.concentration}` : "";
  const settings: Settings = { weighting, response, unit };
  if (options.fixedTop !== undefined) settings.fixedTop = options.fixedTop;
  if (options.fixedBottom !== undefined) settings.fixedBottom = options.fixedBottom;
  return settings;
}

/**
 * Weighting "auto": the replicate-SD trend (weighting.ts), but one wild well inflates its group's
 * SD and can fake that trend — after which relative weighting shrinks its residual and hides it.
 * So a choice of relative is checked once more without the wells an unweighted outlier search
 * (ROUT, leave-one-out starts) proposes; if the trend goes with them, the curve stays unweighted.
 */
function autoWeighting(
  xs: number[],
  ys: number[],
  keys: readonly string[],
  response: Settings["response"],
  options: AnalyseCurveOptions,
  q: number,
): ReturnType<typeof chooseWeighting> {
  const choice = chooseWeighting(keys, ys);
  if (choice.weighting !== "relative") return choice;
  const plain = curveSettings("none", response, options);
  const pre = judge(xs, ys, keys, indices(xs.length), plain);
  if (!pre.fit || !pre.residuals) return choice;
  const search = outlierSearch(xs, ys, pre, plain, q, true);
  if (!search || search.outliers.length === 0) return choice;
  const out = new Set(search.outliers.map((o) => o.index));
  const keep = (_: unknown, i: number) => !out.has(i);
  const again = chooseWeighting(keys.filter(keep), ys.filter(keep));
  if (again.weighting === "relative") return choice;
  const wells = options.rowNames
    ? `${pointsText(
        [...out].sort((a, b) => a - b),
        options.rowNames,
      )}, which`
    : out.size === 1
      ? "the well"
      : `the ${out.size} wells`;
  return {
    ...again,
    reason: `${again.reason}, judged without ${wells} an unweighted outlier search proposes (with ${out.size === 1 ? "it" : "them"}: ${choice.reason})`,
  };
}

/** The result object, written out field by field (one fixed shape: measurably faster than spreads). */
function assemble(
  j: CurveJudgement,
  base: Pick<CurveAnalysis, "weighting" | "outliers" | "robustScale">,
  reported: CurveAnalysis["reported"],
  alternative: CurveAnalysis["alternative"],
): CurveAnalysis {
  return {
    outcome: j.outcome,
    reason: j.reason,
    maxInhibitionPct: j.maxInhibitionPct,
    maxActivationPct: j.maxActivationPct,
    ic50Bracket: j.ic50Bracket,
    fit: j.fit,
    adequacy: j.adequacy,
    doseEffectP: j.doseEffectP,
    flags: j.flags,
    usedIndices: j.usedIndices,
    weighting: base.weighting,
    outliers: base.outliers,
    reported,
    alternative,
    robustScale: base.robustScale,
  };
}

function fitOptions(s: Settings): Logistic4Options {
  const o: Logistic4Options = { weighting: s.weighting };
  if (s.fixedTop !== undefined) o.fixedTop = s.fixedTop;
  if (s.fixedBottom !== undefined) o.fixedBottom = s.fixedBottom;
  return o;
}

/** Number of distinct values (pairwise scan: series are short). */
function countDistinct(x: readonly number[]): number {
  let count = 0;
  for (let i = 0; i < x.length; i++) {
    let seen = false;
    for (let j = 0; j < i && !seen; j++) seen = x[j] === x[i];
    if (!seen) count++;
  }
  return count;
}

/** Cheap screen: is some residual of the ordinary fit beyond OUTLIER_SCREEN_T RSDRs? */
function screenSuggestsOutlier(r: readonly number[], fit: Logistic4Fit): boolean {
  if (fit.dof <= 0) return false;
  const scale = rsdr(r, fit.nParams);
  let max = 0;
  for (let i = 0; i < r.length; i++) max = Math.max(max, Math.abs(r[i]!));
  // With most points exactly on the curve (scale 0) any clearly non-zero residual stands out.
  return scale > 0 ? max > OUTLIER_SCREEN_T * scale : max > 0;
}

function outlierSearch(
  x: number[],
  y: number[],
  core: Judged,
  s: Settings,
  q: number,
  leaveOneOut: boolean,
): { outliers: CurveOutlier[]; robustScale: number } | null {
  const theta = logistic4Theta(core.fit!, s);
  if (!theta) return null;
  let problem = logistic4Problem(x, y, s);
  if (core.factors) problem = scaleRows(problem, core.factors);
  const loo = leaveOneOut ? bestLeaveOneOut(x, y, s, core.plainRss) : null;
  const found = findOutliers(problem, theta, { q, tol: 1e-4, starts: loo ? [loo] : [] });
  return {
    robustScale: found.robustScale,
    outliers: found.outlierIndices.map((i) => ({
      index: i,
      x: x[i]!,
      y: y[i]!,
      residual: found.robust.residuals[i]!,
      p: found.pValues[i]!,
    })),
  };
}

/**
 * A second start for the robust fit: the leave-one-out fit with the smallest residual sum of
 * squares (the deletion diagnostic: the point whose removal improves the fit most). A single wild
 * well can drag the ordinary fit — and a Cauchy fit started there — into a curve that passes
 * through it; the fit without it starts in the right basin. Every subset is first scored by its
 * quick grid start alone (cheap); only the LEAVE_OUT_FITS best are fitted, and only when the best
 * grid already leaves less than LEAVE_OUT_GAIN of the all-points RSS (`allRss`, unweighted): with
 * no point whose removal changes the fit that much, no start without one is needed. (Seeded
 * invented curves: with a ±90 % well the ratio was below 0.45 in 99 % of 300; clean curves went
 * below 0.5 in about 3 %.)
 */
function bestLeaveOneOut(x: number[], y: number[], s: Settings, allRss: number): number[] | null {
  const n = x.length;
  const xs: number[] = [];
  const ys: number[] = [];
  const subset = (leave: number) => {
    xs.length = 0;
    ys.length = 0;
    for (let i = 0; i < n; i++) {
      if (i === leave) continue;
      xs.push(x[i]!);
      ys.push(y[i]!);
    }
  };
  const scored: { leave: number; rss: number }[] = [];
  const grid = { quick: true, fixedTop: s.fixedTop, fixedBottom: s.fixedBottom };
  for (let leave = 0; leave < n; leave++) {
    subset(leave);
    scored.push({ leave, rss: logistic4Start(xs, ys, grid).rss });
  }
  scored.sort((a, b) => a.rss - b.rss || a.leave - b.leave);
  if (!(scored[0]!.rss < LEAVE_OUT_GAIN * allRss)) return null;
  const opts = fitOptions(s);
  let best: number[] | null = null;
  let bestRss = Infinity;
  for (const { leave } of scored.slice(0, LEAVE_OUT_FITS)) {
    subset(leave);
    try {
      const f = fitLogistic4(xs, ys, opts);
      const theta = f.converged ? logistic4Theta(f, s) : null;
      if (theta && f.rss < bestRss) {
        best = theta;
        bestRss = f.rss;
      }
    } catch {
      // Too few points or concentrations without this one: no start from it.
    }
  }
  return best;
}

/** The judgement of the points `idx` (rules 1 and 4–8 of the file comment). */
function judge(xAll: number[], yAll: number[], keysAll: readonly string[] | null, idx: number[], s: Settings): Judged {
  const whole = idx.length === xAll.length;
  const x = whole ? xAll : idx.map((i) => xAll[i]!);
  const y = whole ? yAll : idx.map((i) => yAll[i]!);
  const keys = keysAll === null ? null : whole ? keysAll : idx.map((i) => keysAll[i]!);
  const n = x.length;
  const percent = s.response !== "signal";
  const out: CurveJudgement = {
    outcome: "not-determined",
    // Optional fields present as undefined from the start: one object shape for every curve.
    reason: undefined,
    maxInhibitionPct: undefined,
    maxActivationPct: undefined,
    ic50Bracket: undefined,
    fit: null,
    adequacy: null,
    doseEffectP: null,
    flags: [],
    usedIndices: idx,
  };
  const judged: Judged = { judgement: out, fit: null, residuals: null, factors: null, plainRss: NaN };
  const groups = doseGroups(x, y, s.response === "activity-pct");
  if (percent) out.maxInhibitionPct = groups.maxMean;
  if (n < MIN_DOSE_RESPONSE_POINTS || groups.x.length < MIN_DOSE_RESPONSE_CONCENTRATIONS) {
    out.reason = `too few points: ${n} points at ${groups.x.length} concentrations; at least ${MIN_DOSE_RESPONSE_POINTS} points at ${MIN_DOSE_RESPONSE_CONCENTRATIONS} concentrations are needed`;
    out.flags.push("too-few-points");
    return judged;
  }
  let fit: Logistic4Fit | null = null;
  let fitError = "";
  try {
    fit = fitLogistic4(x, y, fitOptions(s));
  } catch (e) {
    fitError = e instanceof Error ? e.message : String(e);
  }
  let fitted: number[] | null = null;
  if (fit && fit.log10Ic50 !== null) {
    // Plain arrays: a small typed array costs an off-heap allocation, which shows per curve.
    fitted = new Array<number>(n);
    for (let i = 0; i < n; i++) fitted[i] = logistic4Fitted(fit, x[i]!)!;
    const factors = fit.weighting === "relative" ? relativeWeightFactors(fitted) : null;
    const r = new Array<number>(n);
    let plainRss = 0;
    for (let i = 0; i < n; i++) {
      const d = y[i]! - fitted[i]!;
      plainRss += d * d;
      r[i] = d * (factors ? factors[i]! : 1);
    }
    judged.plainRss = plainRss;
    judged.fit = fit;
    judged.residuals = r;
    judged.factors = factors;
  }
  const kTop = groups.top;
  const xTop = groups.x[kTop]!;
  const xLow = groups.lowestPositive;
  const fittedTop = fit ? logistic4Fitted(fit, xTop) : null;
  const fittedTopInh = fittedTop === null ? null : s.response === "activity-pct" ? 100 - fittedTop : fittedTop;

  if (percent) {
    const topMean = groups.mean[kTop]!;
    const topInh = Math.min(topMean, fittedTopInh ?? topMean);
    // The threshold is at least ACTIVATION_MIN_PCT, so the noise SD (a sort of the residuals) is
    // needed only for a top that low.
    if (topInh <= -ACTIVATION_MIN_PCT && groups.maxMean < INACTIVE_BELOW_PCT) {
      const noise = noiseSd(groups, y, fitted, fit);
      const activation = Math.max(ACTIVATION_MIN_PCT, 3 * noise);
      if (topInh <= -activation) {
        out.outcome = "activator";
        out.maxActivationPct = -groups.minMean;
        out.reason = `activity rises with concentration: ${fmt(-topMean)} % above the vehicle at the top concentration ${fmtC(xTop, s.unit)} (noise SD ${fmt(noise)} %), an activator, not an inhibitor`;
        return judged;
      }
    }
    if (groups.maxMean < INACTIVE_BELOW_PCT && (fittedTopInh === null || fittedTopInh < INACTIVE_BELOW_PCT)) {
      out.outcome = "inactive";
      out.reason = `< ${INACTIVE_BELOW_PCT} % inhibition at the top concentration ${fmtC(xTop, s.unit)}: maximum ${fmt(groups.maxMean)} %`;
      return judged;
    }
  }
  if (percent && groups.minMean >= INACTIVE_BELOW_PCT) {
    out.reason = `≥ ${INACTIVE_BELOW_PCT} % inhibition at every concentration: IC50 below the tested range (< ${fmtC(xLow, s.unit)})`;
    out.flags.push("ic50-below-range");
    return judged;
  }
  if (!fit || !fitted || fit.log10Ic50 === null) {
    out.reason = fit ? "the fit gave no finite curve" : `no fit: ${fitError}`;
    return judged;
  }
  const p = doseEffectP(y, fit, judged.factors);
  out.doseEffectP = p;
  if (!(p < DOSE_EFFECT_ALPHA)) {
    const test = `F-test of the curve against a flat line p ${fmtP(p)}`;
    if (!percent) {
      out.outcome = "inactive";
      out.reason = `no significant change of the response with concentration (${test})`;
    } else {
      out.reason = `no significant dose-dependence (${test}): the scatter is not a curve`;
    }
    return judged;
  }
  if (!fit.converged) {
    out.reason = "the fit did not converge";
    out.flags.push("not-converged");
    return judged;
  }
  if (fit.hill !== null && fit.hill > STEP_HILL) {
    const bracket = bracketOf(groups.x, fit.log10Ic50);
    out.flags.push("steep-step");
    if (bracket) {
      out.ic50Bracket = bracket;
      out.reason = `a step (Hill ${fmt(fit.hill)}) between ${fmtC(bracket[0], s.unit)} and ${fmtC(bracket[1], s.unit)}: the IC50 lies between them but the data do not fix it; test concentrations inside the step (steep curves may mean aggregation or tight binding)`;
    } else {
      out.reason = `a step (Hill ${fmt(fit.hill)}) outside the tested concentrations: the IC50 is not fixed by the data`;
    }
    return judged;
  }
  const lTop = Math.log10(xTop);
  const lLow = Math.log10(xLow);
  if (fit.log10Ic50 > lTop + RANGE_SLACK_LOG10 || fit.log10Ic50 < lLow - RANGE_SLACK_LOG10) {
    const above = fit.log10Ic50 > lTop;
    out.reason = `IC50 ${above ? "above" : "below"} the tested range (${above ? ">" : "<"} ${fmtC(above ? xTop : xLow, s.unit)}) by more than half a decade: not determined by these data`;
    out.flags.push(above ? "ic50-above-range" : "ic50-below-range");
    return judged;
  }
  const [lo, hi] = fit.ic50Ci95;
  if (lo === null || hi === null || hi / lo > MAX_CI_RATIO) {
    out.reason =
      lo === null || hi === null
        ? "the 95 % confidence interval of the IC50 is unbounded: not determined by these data"
        : `the 95 % confidence interval of the IC50 spans ${fmt(Math.log10(hi / lo))} decades (${fmtEnd(lo)}–${fmtEnd(hi)}${s.unit}): not determined by these data`;
    out.flags.push("ci-wider-than-10-fold");
    return judged;
  }

  out.outcome = "fitted";
  out.fit = fit;
  const flags: CurveFlag[] = [...fit.flags];
  if (fit.weighting === "relative") flags.push("relative-weighting");
  if (percent && fit.top !== null && fit.bottom !== null && !fit.flags.includes("plateau-not-reached")) {
    // The fitted inhibition plateau at high concentration (top and bottom are canonical).
    const maxPlateau = s.response === "activity-pct" ? 100 - fit.bottom : fit.top;
    if (maxPlateau < PARTIAL_BELOW_PCT) flags.push("partial-inhibition");
  }
  out.adequacy = adequacyOf(x, y, keys, judged.residuals!, judged.factors, fit.nParams);
  if (!out.adequacy.adequate) flags.push("inadequate-fit");
  out.flags = flags;
  return judged;
}

interface DoseGroups {
  /** Distinct concentrations, in order of appearance. */
  x: number[];
  /** Mean % inhibition (or mean response on the signal scale) at each. */
  mean: number[];
  count: number[];
  /** Group of each point. */
  of: number[];
  top: number;
  lowestPositive: number;
  maxMean: number;
  minMean: number;
}

/** Points grouped by concentration; means on the inhibition scale (100 − y for % activity). */
function doseGroups(x: number[], y: number[], activity: boolean): DoseGroups {
  const gx: number[] = [];
  const mean: number[] = [];
  const count: number[] = [];
  const of: number[] = new Array<number>(x.length);
  for (let i = 0; i < x.length; i++) {
    const xi = x[i]!;
    let g = 0;
    while (g < gx.length && gx[g] !== xi) g++;
    if (g === gx.length) {
      gx.push(xi);
      mean.push(0);
      count.push(0);
    }
    mean[g] = mean[g]! + (activity ? 100 - y[i]! : y[i]!);
    count[g] = count[g]! + 1;
    of[i] = g;
  }
  let top = 0;
  let lowestPositive = Infinity;
  let maxMean = -Infinity;
  let minMean = Infinity;
  for (let g = 0; g < gx.length; g++) {
    const m = mean[g]! / count[g]!;
    mean[g] = m;
    if (m > maxMean) maxMean = m;
    if (m < minMean) minMean = m;
    if (gx[g]! > gx[top]!) top = g;
    if (gx[g]! > 0 && gx[g]! < lowestPositive) lowestPositive = gx[g]!;
  }
  return { x: gx, mean, count, of, top, lowestPositive, maxMean, minMean };
}

/**
 * Noise SD on the response scale: pooled SD of replicates at the same concentration when there
 * are at least 2 pure-error df, else the RSDR of the fit's unweighted residuals, else the SD of
 * the responses.
 */
function noiseSd(groups: DoseGroups, y: number[], fitted: number[] | null, fit: Logistic4Fit | null): number {
  const n = y.length;
  const df = n - groups.x.length;
  if (df >= 2) {
    // Pure error about the group means (on the response scale: the sign of % activity is irrelevant).
    const m = new Float64Array(groups.x.length);
    for (let i = 0; i < n; i++) {
      const g = groups.of[i]!;
      m[g] = m[g]! + y[i]! / groups.count[g]!;
    }
    let ss = 0;
    for (let i = 0; i < n; i++) ss += (y[i]! - m[groups.of[i]!]!) ** 2;
    return Math.sqrt(ss / df);
  }
  if (fitted && fit && fit.dof > 0) {
    const r = new Array<number>(n);
    for (let i = 0; i < n; i++) r[i] = y[i]! - fitted[i]!;
    const s = rsdr(r, fit.nParams);
    if (Number.isFinite(s)) return s;
  }
  let mean = 0;
  for (const v of y) mean += v / n;
  let ss = 0;
  for (const v of y) ss += (v - mean) ** 2;
  return Math.sqrt(ss / Math.max(1, n - 1));
}

/**
 * Extra-sum-of-squares F-test of the 4PL against a flat line (1 parameter) under the fit's own
 * final weights, F = ((RSS₀ − RSS)/(p − 1)) / (RSS/(n − p)) (Motulsky & Christopoulos 2004
 * [from memory]); RSS₀ is the weighted sum of squares about the weighted mean.
 */
function doseEffectP(y: number[], fit: Logistic4Fit, factors: Float64Array | null): number {
  const n = y.length;
  const p = fit.nParams;
  if (n - p <= 0 || p < 2) return NaN;
  let sw = 0;
  let swy = 0;
  for (let i = 0; i < n; i++) {
    const w = factors ? factors[i]! * factors[i]! : 1;
    sw += w;
    swy += w * y[i]!;
  }
  const mean = swy / sw;
  let rss0 = 0;
  for (let i = 0; i < n; i++) rss0 += (factors ? factors[i]! * factors[i]! : 1) * (y[i]! - mean) ** 2;
  const rss = fit.rss;
  if (!(rss > 0)) return rss0 > 0 ? 0 : 1;
  const f = Math.max(0, rss0 - rss) / (p - 1) / (rss / (n - p));
  return fSurvival(f, p - 1, n - p);
}

/** The two adjacent tested concentrations around 10^l, or null when l is outside them. */
function bracketOf(concentrations: readonly number[], l: number): [number, number] | null {
  const c = concentrations.filter((v) => v > 0).sort((a, b) => a - b);
  for (let k = 0; k + 1 < c.length; k++) {
    if (Math.log10(c[k]!) <= l && l <= Math.log10(c[k + 1]!)) return [c[k]!, c[k + 1]!];
  }
  return null;
}

/**
 * Lack of fit across replicate doses (when there are replicates) and the runs test of the
 * residuals ordered by dose (ties in input order), both on the fit's own scale (adequacy.ts).
 */
function adequacyOf(
  x: number[],
  y: number[],
  keys: readonly string[] | null,
  residuals: readonly number[],
  factors: Float64Array | null,
  nParams: number,
): NonNullable<CurveJudgement["adequacy"]> {
  const n = x.length;
  // Dilution series usually arrive sorted (either way); a strictly falling one is just reversed.
  let rising = true;
  let falling = true;
  for (let i = 1; i < n; i++) {
    if (x[i]! < x[i - 1]!) rising = false;
    if (x[i]! >= x[i - 1]!) falling = false;
  }
  // Single wells in dose order, either way: the runs test depends only on the counts of signs
  // and of runs, which reversing leaves alone, so the residuals are read as they are.
  if (keys === null && (rising || falling)) return runsOnly(cachedRunsTest(residuals));
  const order: number[] = new Array<number>(n);
  for (let i = 0; i < n; i++) order[i] = falling && !rising ? n - 1 - i : i;
  if (!rising && !falling) order.sort((a, b) => x[a]! - x[b]! || a - b);
  const res = new Array<number>(n);
  for (let k = 0; k < n; k++) res[k] = residuals[order[k]!]!;
  // Single wells: no pure error, so no lack-of-fit test; the runs test alone.
  if (keys === null) return runsOnly(cachedRunsTest(res));
  const k = order.map((i) => keys[i]!);
  const obs = order.map((i) => y[i]! * (factors ? factors[i]! : 1));
  return assessAdequacy(k, obs, res, nParams);
}

function runsOnly(runs: RunsTest): NonNullable<CurveJudgement["adequacy"]> {
  const reasons: string[] = [];
  if (runs.p < ADEQUACY_ALPHA)
    reasons.push(
      `residual pattern: ${runs.runs} runs of signs where ${runs.expected.toFixed(1)} are expected (p ${runs.p.toPrecision(2)})`,
    );
  return { lackOfFit: null, runs, adequate: reasons.length === 0, reasons };
}

const runsCache = new Map<number, RunsTest>();

/**
 * runsTest, memoised on (n₊, n₋, runs): its exact p sums many log-binomials, while a batch of
 * ten-point curves meets only a few hundred distinct triples.
 */
function cachedRunsTest(res: readonly number[]): RunsTest {
  let n1 = 0;
  let n2 = 0;
  let runs = 0;
  let last = 0;
  for (const r of res) {
    const sign = r > 0 ? 1 : r < 0 ? -1 : 0;
    if (sign === 0) continue;
    if (sign > 0) n1++;
    else n2++;
    if (sign !== last) runs++;
    last = sign;
  }
  if (n1 + n2 > 200) return runsTest(res);
  const key = (n1 * 256 + n2) * 512 + runs;
  let hit = runsCache.get(key);
  if (!hit) {
    hit = runsTest(res);
    if (runsCache.size < 50_000) runsCache.set(key, hit);
  }
  return { runs: hit.runs, expected: hit.expected, p: hit.p };
}

function fmt(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(3))) : String(v);
}
/** A concentration for a sentence, 4 significant figures, with `unit` (" µM" or "") after it. */
function fmtC(v: number, unit = ""): string {
  return String(Number(v.toPrecision(4))) + unit;
}
/** A fitted CI end: 3 significant figures, powers of ten beyond 10⁻³…10⁵ ("1.4e-5", not "0.00001445"). */
function fmtEnd(v: number): string {
  const a = Math.abs(v);
  return a !== 0 && (a < 1e-3 || a >= 1e5) ? v.toExponential(1) : fmt(v);
}
const OUTCOME_WORDS: Record<CurveOutcome, string> = {
  fitted: "fitted",
  inactive: "inactive",
  activator: "an activator",
  "not-determined": "not determined",
};
/** "well C07" or "wells C07, D07" from point indices and the caller's names. */
function pointsText(idx: readonly number[], names: readonly string[]): string {
  return `${idx.length > 1 ? "wells" : "well"} ${idx.map((k) => names[k] ?? `point ${k + 1}`).join(", ")}`;
}
function fmtP(p: number): string {
  return Number.isFinite(p) ? p.toPrecision(2) : "n/a";
}
