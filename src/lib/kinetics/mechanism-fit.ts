/**
 * Mechanism of action from a substrate × inhibitor matrix of initial rates: global least-squares
 * fits of the competitive, uncompetitive, noncompetitive and mixed models (inhibition-models.ts),
 * then a model choice.
 *
 * Parameterisation v = V·S/(Km(1 + a·I) + S(1 + b·I)), a = 1/Kic ≥ 0, b = 1/Kiu ≥ 0, so that the
 * mixed model reaches its competitive (b = 0) and uncompetitive (a = 0) boundaries with finite
 * parameters. Standard errors from Cov = inverse(JᵀJ)·RSS/(n − p) (Bates & Watts 1988); Kic, Kiu
 * by the delta method and CIs by inverting the CI of a, b (null = unbounded).
 *
 * Choice (Burnham & Anderson 2002; Motulsky & Christopoulos 2004 [from memory]):
 * 1. AICc for each model (K = fitted parameters + 1), Akaike weights.
 * 2. If a three-parameter model has the lowest AICc, it is chosen.
 * 3. If mixed has the lowest AICc, it is chosen only when the extra-sum-of-squares F-test favours
 *    it at p < 0.05 against every nested three-parameter model — that is, against the best of
 *    them (the one with the lowest RSS has the largest p). Otherwise that best simpler model is
 *    kept. The F-test at the a = 0 or b = 0 boundary is approximate (nesting on a boundary).
 * 4. Label "ambiguous" when any other model's AICc is less than 2 above the chosen one's (or
 *    below it), or when mixed is chosen with an F-test p of CLEAR_F_ALPHA (0.001) or more, else
 *    "clear" (a p just under 0.05 is one false "mixed" call in twenty from a simpler truth).
 * Ties (equal AICc, as when the data show no inhibition) resolve in the order competitive,
 * uncompetitive, noncompetitive, mixed.
 *
 * For exact (noise-free) data, RSS values below 1e-16 of Σ(w·y)² are treated as that floor when
 * computing AICc and F, so rounding noise cannot decide the model.
 *
 * Rows with substrate 0 are accepted: every model predicts v = 0 there, so they do not move the
 * parameters but do count in n and RSS (unweighted). With relative weighting (residual / observed
 * rate) they are left out, since their weight would be infinite.
 *
 * Beyond the choice (mechanism-judgement.ts): every model carries its adequacy (lack of fit over
 * replicate (S, I) cells, runs test along S within each inhibitor series); models outside the four
 * (substrate inhibition, partial inhibition, tight binding with `enzymeConc`) are fitted when the
 * data call for them; the result recommends a model and labels the standard call "inadequate"
 * when it fails or is superseded. Weighting "auto" reads the error model from the replicate
 * groups (weighting.ts): relative weights then come from the replicate-group means, 1/ȳ_g, one
 * weight per (S, I) cell shared by every model, so that AICc, F-tests and lack of fit compare like
 * with like. Outliers: when the largest residual of the recommended fit, over its robust SD (RSDR),
 * is extreme enough that ROUT could flag it (its two-sided t p-value within OUTLIER_SCREEN_MARGIN
 * times the Benjamini–Hochberg threshold Q/n), or when asked, ROUT (robust.ts) proposes outlying
 * rows; nothing is dropped.
 */
import { levenbergMarquardt, parameterCovariance, type LeastSquaresProblem } from "./least-squares";
import { michaelisMentenStart } from "./michaelis-menten";
import { aicc, akaikeWeights, extraSumOfSquaresFTest, type FTestResult } from "./model-selection";
import { INHIBITION_MODELS, MODEL_PARAMETER_COUNT, type InhibitionModel } from "./inhibition-models";
import { type Interval, finiteOrNull, reciprocalConstant, waldInterval95 } from "./parameter-summary";
import {
  adequacyContext,
  extendedConstants,
  extendedProblem,
  mechanismAdequacy,
  type ExtendedModel,
  type AdequacyContext,
  type ExtendedModelFit,
  type MechanismAdequacy,
  type MechanismData,
} from "./mechanism-models";
import {
  CLEAR_F_ALPHA,
  concText,
  judgeMechanism,
  type JudgementUnits,
  type MechanismFlag,
  type MechanismLabel,
  type MechanismRecommendation,
  type MechanismScreens,
} from "./mechanism-judgement";
import {
  chooseWeighting,
  RELATIVE_WEIGHT_FLOOR,
  WEIGHTING_MIN_SLOPE,
  type ReplicateGroup,
  type WeightingChoice,
} from "./weighting";
import { DEFAULT_OUTLIER_Q, findOutliers, rsdr } from "./robust";
import { studentTCdf } from "./distributions";

export interface MechanismPoint {
  substrate: number;
  inhibitor: number;
  rate: number;
}

export interface MechanismOptions {
  /**
   * "none" (default): ordinary least squares. "relative": residuals divided by the observed rate.
   * "auto": relative (divided by the replicate-group mean rate) when the replicate groups show SD
   * growing with the rate (weighting.ts), else none; the result says which and why.
   */
  weighting?: "none" | "relative" | "auto";
  /** Total enzyme concentration, same unit as substrate and inhibitor: enables the tight-binding check. */
  enzymeConc?: number;
  /** Extended models: "auto" (default) when the data call for them, "all" always, "none" never. */
  extendedModels?: "auto" | "all" | "none";
  /** Outlier proposal (ROUT): "auto" (default) when a cheap screen suggests one, "always", "never". */
  outliers?: "auto" | "always" | "never";
  /** False discovery rate of the outlier proposal (default 0.01). */
  outlierQ?: number;
  /** Unit labels for the sentences ("µM", "signal/s"); the engine is unit-agnostic, so none by default. */
  units?: JudgementUnits;
  /** A name for each input row in the sentences (a well, e.g. "C05"); default "row k" (1-based). */
  rowNames?: readonly string[];
}

/**
 * ROUT runs when the largest |residual|/RSDR, read as a t on n − p df, has a two-sided p within this
 * factor of the smallest Benjamini–Hochberg threshold Q/n. The ordinary fit's residual understates
 * an outlier's robust one (the outlier pulls the fit), hence the margin. On 400 invented matrices
 * (testdata/synthetic.ts) with one wild well (+8 SD), ROUT run on every matrix caught 389 and run
 * behind this screen 388, while the screen fired on 2 % of the clean matrices (a margin of 10: 6 %,
 * the same 388 caught; a fixed 3 RSDR: 14 %).
 */
export const OUTLIER_SCREEN_MARGIN = 3;

export interface MechanismWeightingChoice {
  requested: "none" | "relative" | "auto";
  used: "none" | "relative";
  /** What relative weights divide by: the observed rate or the replicate-group mean; null unweighted. */
  basis: "observed rate" | "replicate mean" | null;
  reason: string;
  /** The replicate-scatter test (weighting.ts), when it was run. */
  test: WeightingChoice | null;
}

export interface MechanismOutliers {
  /** "screen": only the cheap screen ran (nothing suspicious); "rout": the robust fit ran. */
  checked: "screen" | "rout";
  /** Largest |residual| / RSDR of the chosen fit. */
  largestStandardized: number;
  /** The model whose residuals were judged: the recommended one, else the standard choice. */
  model: InhibitionModel | ExtendedModel;
  /** Proposed outliers: indices into the input points (nothing is dropped). */
  indices: number[];
  /** Of each proposed row (same order as `indices`): residual / RSDR at the robust fit (signed, dimensionless). */
  standardized: number[];
  /** Of each proposed row: the two-sided p-value of that standardized residual (t on n − p df). */
  pValues: number[];
  q: number;
  /** The call without the proposed outliers (null when none are proposed or too few rows remain). */
  callWithout: InhibitionModel | ExtendedModel | null;
  /** Its Ki (Kic, or Kiu where there is no Kic). */
  kiWithout: number | null;
}

export interface MechanismModelFit {
  model: InhibitionModel;
  nParams: number;
  vmax: number;
  km: number;
  /** Kic (binding to free enzyme); null where the model has none or a = 0 (infinite). */
  kic: number | null;
  /** Kiu (binding to the enzyme–substrate complex); null where the model has none or b = 0. */
  kiu: number | null;
  /** α = Kiu/Kic: null for competitive (infinite), 0 for uncompetitive, 1 for noncompetitive. */
  alpha: number | null;
  /** Fitted reciprocal constants a = 1/Kic and b = 1/Kiu (0 where absent). */
  a: number;
  b: number;
  se: {
    vmax: number | null;
    km: number | null;
    kic: number | null;
    kiu: number | null;
    a: number | null;
    b: number | null;
  };
  ci95: { vmax: Interval; km: Interval; kic: Interval; kiu: Interval };
  rss: number;
  aicc: number;
  deltaAicc: number;
  akaikeWeight: number;
  /** Extra-sum-of-squares F-test of this model against mixed (null for mixed itself). */
  fTestVsMixed: FTestResult | null;
  dof: number;
  converged: boolean;
  /** Lack of fit over replicate (S, I) cells and runs test along S within each inhibitor series. */
  adequacy: MechanismAdequacy;
}

export interface MechanismResult {
  /** The standard (four-model) choice. */
  best: InhibitionModel;
  /** Of the standard choice: "inadequate" when it fails adequacy or a model outside the four is recommended. */
  label: MechanismLabel;
  models: Record<InhibitionModel, MechanismModelFit>;
  /** Rows used in the fit. */
  n: number;
  weighting: "none" | "relative";
  weightingChoice: MechanismWeightingChoice;
  /** The model to report (standard or extended), or null when none is adequate. */
  recommended: MechanismRecommendation | null;
  /** Extended models fitted because the data called for them (empty otherwise). */
  alternatives: ExtendedModelFit[];
  screens: MechanismScreens;
  flags: MechanismFlag[];
  outliers: MechanismOutliers | null;
}

type Data = MechanismData & { rowIndex: Int32Array };

/** Maps a model's free parameter vector to (V, Km, a, b). */
function unpack(model: InhibitionModel, t: ArrayLike<number>): [number, number, number, number] {
  switch (model) {
    case "competitive":
      return [t[0]!, t[1]!, t[2]!, 0];
    case "uncompetitive":
      return [t[0]!, t[1]!, 0, t[2]!];
    case "noncompetitive":
      return [t[0]!, t[1]!, t[2]!, t[2]!];
    case "mixed":
      return [t[0]!, t[1]!, t[2]!, t[3]!];
  }
}

function makeProblem(model: InhibitionModel, d: Data): LeastSquaresProblem {
  const p = MODEL_PARAMETER_COUNT[model];
  const lower = model === "mixed" ? [-Infinity, 0, 0, 0] : [-Infinity, 0, 0];
  const { s, i: inh, y, w, n } = d;
  return {
    nParams: p,
    nObs: n,
    lower,
    evaluate(theta, r, jac) {
      // Direct reads (no array from unpack): this runs for every iteration of every fit.
      const vmax = theta[0]!;
      const km = theta[1]!;
      const a = model === "uncompetitive" ? 0 : theta[2]!;
      const b = model === "competitive" ? 0 : model === "mixed" ? theta[3]! : theta[2]!;
      for (let k = 0; k < n; k++) {
        const sk = s[k]!;
        const ik = inh[k]!;
        const wk = w[k]!;
        const ka = 1 + a * ik;
        const den = km * ka + sk * (1 + b * ik);
        const g = den !== 0 ? sk / den : 0; // S = 0 rows: v = 0 whatever the parameters
        r[k] = wk * (y[k]! - vmax * g);
        if (jac) {
          const row = k * p;
          const q = den !== 0 ? (wk * vmax * g) / den : 0; // w·V·S/den²
          jac[row] = wk * g;
          jac[row + 1] = -q * ka;
          const da = -q * km * ik;
          const db = -q * sk * ik;
          if (model === "competitive") jac[row + 2] = da;
          else if (model === "uncompetitive") jac[row + 2] = db;
          else if (model === "noncompetitive") jac[row + 2] = da + db;
          else {
            jac[row + 2] = da;
            jac[row + 3] = db;
          }
        }
      }
    },
  };
}

/** RSS of (V, Km, a, b) with V projected out (the model is linear in V). */
function projectedRss(d: Data, km: number, a: number, b: number): { rss: number; vmax: number } {
  let sgg = 0;
  let sgy = 0;
  let syy = 0;
  for (let k = 0; k < d.n; k++) {
    const sk = d.s[k]!;
    const ik = d.i[k]!;
    const den = km * (1 + a * ik) + sk * (1 + b * ik);
    const g = den !== 0 ? (d.w[k]! * sk) / den : 0;
    const yk = d.w[k]! * d.y[k]!;
    sgg += g * g;
    sgy += g * yk;
    syy += yk * yk;
  }
  if (!(sgg > 0)) return { rss: Infinity, vmax: 0 };
  const vmax = sgy / sgg;
  return { rss: Math.max(0, syy - vmax * sgy), vmax };
}

/** Grid start for a three-parameter model: Km around the uninhibited estimate, the inhibition
 * constant on a log grid around the typical inhibitor concentration (and 0). */
function gridStart(model: Exclude<InhibitionModel, "mixed">, d: Data, km0: number, iRef: number): number[] {
  let best = { rss: Infinity, start: [1, km0, 0] as number[] };
  const kGrid = [0];
  for (let j = -4; j <= 4; j++) kGrid.push(Math.pow(10, j / 2) / iRef);
  for (const kmMul of [0.5, 1, 2]) {
    const km = km0 * kmMul;
    for (const k of kGrid) {
      const a = model === "uncompetitive" ? 0 : k;
      const b = model === "competitive" ? 0 : k;
      const pr = projectedRss(d, km, a, b);
      if (pr.rss < best.rss) best = { rss: pr.rss, start: [pr.vmax, km, k] };
    }
  }
  return best.start;
}

interface RawFit {
  theta: Float64Array;
  rss: number;
  cov: number[] | null;
  converged: boolean;
  residuals: Float64Array;
}

function fitFrom(model: InhibitionModel, d: Data, start: number[]): RawFit {
  const problem = makeProblem(model, d);
  const res = levenbergMarquardt(problem, start);
  const residuals = new Float64Array(d.n);
  problem.evaluate(res.theta, residuals, null);
  return {
    theta: res.theta,
    rss: res.rss,
    cov: parameterCovariance(res, d.n, problem.nParams),
    converged: res.converged,
    residuals,
  };
}

function median(values: number[]): number {
  const v = [...values].sort((x, y) => x - y);
  const m = v.length >> 1;
  return v.length % 2 ? v[m]! : 0.5 * (v[m - 1]! + v[m]!);
}

function prepare(points: readonly MechanismPoint[], weighting: "none" | "relative"): Data {
  const rows: MechanismPoint[] = [];
  const index: number[] = [];
  points.forEach((pt, k) => {
    const { substrate, inhibitor, rate } = pt;
    if (!Number.isFinite(substrate) || substrate < 0)
      throw new RangeError(`fitMechanism: row ${k + 1}: substrate must be a finite number ≥ 0 (got ${substrate})`);
    if (!Number.isFinite(inhibitor) || inhibitor < 0)
      throw new RangeError(`fitMechanism: row ${k + 1}: inhibitor must be a finite number ≥ 0 (got ${inhibitor})`);
    if (!Number.isFinite(rate)) throw new RangeError(`fitMechanism: row ${k + 1}: rate must be finite (got ${rate})`);
    if (weighting === "relative") {
      if (substrate === 0) return; // infinite weight; carries no information on the parameters
      if (!(rate > 0))
        throw new RangeError(`fitMechanism: row ${k + 1}: relative weighting needs a positive rate (got ${rate})`);
    }
    rows.push(pt);
    index.push(k);
  });
  const n = rows.length;
  const d: Data = {
    s: new Float64Array(n),
    i: new Float64Array(n),
    y: new Float64Array(n),
    w: new Float64Array(n),
    n,
    rowIndex: Int32Array.from(index),
  };
  rows.forEach((r, k) => {
    d.s[k] = r.substrate;
    d.i[k] = r.inhibitor;
    d.y[k] = r.rate;
    d.w[k] = weighting === "relative" ? 1 / r.rate : 1;
  });
  return d;
}

/** Checks that a data set can support the four fits; returns a reason or null. */
export function mechanismDataProblem(points: readonly MechanismPoint[]): string | null {
  const substrates = new Set<number>();
  const inhibitors = new Set<number>();
  for (const p of points) {
    if (p.substrate > 0) substrates.add(p.substrate);
    inhibitors.add(p.inhibitor);
  }
  if (points.length < 7) return `${points.length} rows; at least 7 are needed to compare the four models`;
  if (inhibitors.size < 2) return `only one inhibitor concentration; at least 2 are needed`;
  if (substrates.size < 3)
    return `${substrates.size} distinct positive substrate concentrations; at least 3 are needed`;
  return null;
}

/** Relative weights from the replicate-group means: w = 1/max(|ȳ_g|, floor·max|ȳ|), S = 0 rows left out. */
function groupMeanWeighted(d: Data): Data {
  const keep: number[] = [];
  for (let k = 0; k < d.n; k++) if (d.s[k]! > 0) keep.push(k);
  const n = keep.length;
  const out: Data = {
    s: new Float64Array(n),
    i: new Float64Array(n),
    y: new Float64Array(n),
    w: new Float64Array(n),
    n,
    rowIndex: new Int32Array(n),
  };
  const sums = new Map<string, { sum: number; count: number }>();
  keep.forEach((k, j) => {
    out.s[j] = d.s[k]!;
    out.i[j] = d.i[k]!;
    out.y[j] = d.y[k]!;
    out.rowIndex[j] = d.rowIndex[k]!;
    const key = `${d.s[k]}|${d.i[k]}`;
    const g = sums.get(key) ?? { sum: 0, count: 0 };
    g.sum += d.y[k]!;
    g.count++;
    sums.set(key, g);
  });
  let maxAbs = 0;
  for (const g of sums.values()) maxAbs = Math.max(maxAbs, Math.abs(g.sum / g.count));
  const floor = RELATIVE_WEIGHT_FLOOR * maxAbs;
  for (let j = 0; j < n; j++) {
    const g = sums.get(`${out.s[j]}|${out.i[j]}`)!;
    const m = Math.max(Math.abs(g.sum / g.count), floor);
    out.w[j] = m > 0 ? 1 / m : 1;
  }
  return out;
}

/** Rows without the ones at positions `drop` (positions in d). */
function without(d: Data, drop: ReadonlySet<number>): Data {
  const keep: number[] = [];
  for (let k = 0; k < d.n; k++) if (!drop.has(k)) keep.push(k);
  const pick = (a: Float64Array) => Float64Array.from(keep, (k) => a[k]!);
  return {
    s: pick(d.s),
    i: pick(d.i),
    y: pick(d.y),
    w: pick(d.w),
    n: keep.length,
    rowIndex: Int32Array.from(keep, (k) => d.rowIndex[k]!),
  };
}

interface StandardFit {
  best: InhibitionModel;
  label: "clear" | "ambiguous";
  models: Record<InhibitionModel, MechanismModelFit>;
  raw: Record<InhibitionModel, RawFit>;
  ctx: AdequacyContext;
  rssFloor: number;
  iRef: number;
  sMax: number;
}

/** The four fits, their adequacy and the standard choice (the file comment's rules 1–4). */
function fitStandard(d: Data): StandardFit {
  const problemText = mechanismDataProblem(
    Array.from({ length: d.n }, (_, k) => ({ substrate: d.s[k]!, inhibitor: d.i[k]!, rate: d.y[k]! })),
  );
  if (problemText) throw new RangeError(`fitMechanism: ${problemText}`);

  // Uninhibited Michaelis–Menten start from the lowest inhibitor level.
  let iMin = Infinity;
  let sMax = 0;
  const positiveI: number[] = [];
  for (let k = 0; k < d.n; k++) {
    iMin = Math.min(iMin, d.i[k]!);
    sMax = Math.max(sMax, d.s[k]!);
    if (d.i[k]! > 0) positiveI.push(d.i[k]!);
  }
  const s0: number[] = [];
  const v0: number[] = [];
  const w0: number[] = [];
  for (let k = 0; k < d.n; k++) {
    if (d.i[k] === iMin) {
      s0.push(d.s[k]!);
      v0.push(d.y[k]!);
      w0.push(d.w[k]!);
    }
  }
  const [, km0] = michaelisMentenStart(s0, v0, w0);
  const iRef = positiveI.length ? median(positiveI) : 1;

  const raw = {} as Record<InhibitionModel, RawFit>;
  for (const model of ["competitive", "uncompetitive", "noncompetitive"] as const) {
    raw[model] = fitFrom(model, d, gridStart(model, d, km0, iRef));
  }
  // Mixed starts from the best nested solution: LM never increases RSS, so the mixed RSS is
  // never above any nested model's and every F statistic is ≥ 0.
  let nested: Exclude<InhibitionModel, "mixed"> = "competitive";
  for (const model of ["uncompetitive", "noncompetitive"] as const)
    if (raw[model].rss < raw[nested].rss) nested = model;
  raw.mixed = fitFrom("mixed", d, [...unpack(nested, raw[nested].theta)]);

  let syy = 0;
  for (let k = 0; k < d.n; k++) syy += (d.w[k]! * d.y[k]!) ** 2;
  const rssFloor = Math.max(1e-16 * syy, Number.MIN_VALUE); // > 0 even if every rate is 0
  const effRss = (m: InhibitionModel): number => Math.max(raw[m].rss, rssFloor);

  const aiccs = INHIBITION_MODELS.map((m) => aicc(effRss(m), d.n, MODEL_PARAMETER_COUNT[m]));
  const weights = akaikeWeights(aiccs);
  const minAicc = Math.min(...aiccs);

  const fTests = {} as Record<InhibitionModel, FTestResult | null>;
  for (const m of INHIBITION_MODELS) {
    fTests[m] = m === "mixed" ? null : extraSumOfSquaresFTest(effRss(m), d.n - 3, effRss("mixed"), d.n - 4);
  }

  const ctx = adequacyContext(d);
  const models = {} as Record<InhibitionModel, MechanismModelFit>;
  INHIBITION_MODELS.forEach((m, idx) => {
    const adequacy = mechanismAdequacy(ctx, d, raw[m].residuals, MODEL_PARAMETER_COUNT[m], rssFloor);
    models[m] = summarise(m, raw[m], d.n, aiccs[idx]!, aiccs[idx]! - minAicc, weights[idx]!, fTests[m], adequacy);
  });

  // Choice: lowest AICc (first in model order on ties) ...
  let best: InhibitionModel = "competitive";
  for (const m of INHIBITION_MODELS) if (models[m].aicc < models[best].aicc) best = m;
  // ... but mixed must beat the best nested model by the F-test at p < 0.05.
  if (best === "mixed") {
    let bestSimple: InhibitionModel = "competitive";
    for (const m of ["uncompetitive", "noncompetitive"] as const)
      if (models[m].aicc < models[bestSimple].aicc) bestSimple = m;
    const p = fTests[bestSimple]!.p;
    if (!(p < 0.05)) best = bestSimple;
  }
  const chosenAicc = models[best].aicc;
  let ambiguous = INHIBITION_MODELS.some((m) => m !== best && models[m].aicc - chosenAicc < 2);
  if (best === "mixed") {
    for (const m of ["competitive", "uncompetitive", "noncompetitive"] as const)
      if (!(fTests[m]!.p < CLEAR_F_ALPHA)) ambiguous = true;
  }
  return { best, label: ambiguous ? "ambiguous" : "clear", models, raw, ctx, rssFloor, iRef, sMax };
}

/** The Ki a lead would quote: Kic, or Kiu where there is none (uncompetitive). */
function quotedKiOf(kic: number | null, kiu: number | null): number | null {
  return kic ?? kiu;
}

function quotedKi(m: MechanismModelFit): number | null {
  return quotedKiOf(m.kic, m.kiu);
}

/** A Ki that moves more than 2-fold (or appears or vanishes) changes what a lead would act on. */
function kiMoved(before: number | null, after: number | null): boolean {
  if (before === null || after === null) return before !== after;
  return Math.abs(Math.log(after / before)) > Math.LN2;
}

/**
 * A cheap necessary condition for chooseWeighting to pick relative weighting, so that the full
 * test runs only where it can: with equal replicate counts its weighted slope of ln SD on ln mean
 * is the ordinary least-squares slope (the weights and the bias correction are the same for every
 * group), and relative needs a slope ≥ WEIGHTING_MIN_SLOPE; skip only below half of that. Unequal
 * counts always run the full test.
 */
function mayBeProportional(groups: readonly ReplicateGroup[]): boolean {
  let n = 0;
  let maxAbs = 0;
  let count = 0;
  for (const g of groups) {
    if (!(g.sd > 0)) continue;
    if (n > 0 && g.n !== count) return true;
    count = g.n;
    n++;
    maxAbs = Math.max(maxAbs, Math.abs(g.mean));
  }
  if (n < 3) return false; // chooseWeighting needs three groups with scatter
  let sx = 0;
  let sy = 0;
  let sxx = 0;
  let sxy = 0;
  for (const g of groups) {
    if (!(g.sd > 0)) continue;
    const x = Math.log(Math.max(Math.abs(g.mean), 0.01 * maxAbs));
    const y = Math.log(g.sd);
    sx += x;
    sy += y;
    sxx += x * x;
    sxy += x * y;
  }
  const vx = sxx - (sx * sx) / n;
  if (!(vx > 0)) return false;
  return (sxy - (sx * sy) / n) / vx >= 0.5 * WEIGHTING_MIN_SLOPE;
}

/** "slope of log SD on log mean 0.98 ± 0.43 over 18 replicate groups, p 0.018" */
function slopeText(test: WeightingChoice): string {
  return `slope of log SD on log mean ${test.slope!.toFixed(2)} ± ${test.slopeSe!.toFixed(2)} over ${test.groups} replicate groups, p ${test.p!.toPrecision(2)}`;
}

/**
 * Weighting "auto" for a matrix: the replicate-SD trend (weighting.ts). One wild well inflates its
 * replicate group's SD and can fake that trend, after which relative weighting shrinks its residual
 * and hides it. So a choice of relative is checked once more without the rows an unweighted ROUT
 * search on the standard choice proposes; if the trend goes with them, the matrix stays unweighted
 * and those rows are left to the outlier step (the rule analyseCurve applies to a curve). The
 * unweighted fit is returned when it was made, so that it is not made twice.
 */
function autoWeighting(
  plain: Data,
  q: number,
  rowNames: readonly string[] | undefined,
): { choice: WeightingChoice; reason: string; plainFit: StandardFit | null } {
  const choice = chooseWeighting(adequacyContext(plain).replicates);
  const relativeReason = (t: WeightingChoice) =>
    `SD grows with the rate (${slopeText(t)}): relative weighting, each rate divided by the mean of its replicate group`;
  if (choice.weighting !== "relative") return { choice, reason: choice.reason, plainFit: null };
  let plainFit: StandardFit;
  try {
    plainFit = fitStandard(plain);
  } catch {
    return { choice, reason: relativeReason(choice), plainFit: null }; // the weighted fit reports the data problem
  }
  const best = plainFit.best;
  const rout = findOutliers(makeProblem(best, plain), Array.from(plainFit.raw[best].theta), { q });
  if (rout.outlierIndices.length === 0) return { choice, reason: relativeReason(choice), plainFit };
  const again = chooseWeighting(adequacyContext(without(plain, new Set(rout.outlierIndices))).replicates);
  const which = rowsText(
    rout.outlierIndices.map((k) => plain.rowIndex[k]!),
    rowNames,
  );
  if (again.weighting === "relative")
    return {
      choice,
      reason: `${relativeReason(choice)}; the trend holds without ${which}, which an unweighted outlier search proposes`,
      plainFit,
    };
  const it = rout.outlierIndices.length === 1 ? "it" : "them";
  return {
    choice: again,
    reason: `${again.reason}, judged without ${which}, which an unweighted outlier search proposes (with ${it}: ${slopeText(choice)}, which alone would choose relative weighting)`,
    plainFit,
  };
}

/** "row 28", "rows 3, 28", or the caller's names: "well C05", "wells C05, D07". */
function rowsText(indices: readonly number[], names: readonly string[] | undefined): string {
  const many = indices.length > 1;
  if (names) return `${many ? "wells" : "well"} ${indices.map((k) => names[k] ?? `row ${k + 1}`).join(", ")}`;
  return `${many ? "rows" : "row"} ${indices.map((k) => k + 1).join(", ")}`;
}

function checkOptions(options: MechanismOptions): void {
  const { weighting, enzymeConc, extendedModels, outliers, outlierQ } = options;
  if (weighting !== undefined && !["none", "relative", "auto"].includes(weighting))
    throw new RangeError(`fitMechanism: weighting must be none, relative or auto (got ${String(weighting)})`);
  if (enzymeConc !== undefined && !(Number.isFinite(enzymeConc) && enzymeConc > 0))
    throw new RangeError(`fitMechanism: enzymeConc must be a finite number > 0 (got ${enzymeConc})`);
  if (extendedModels !== undefined && !["auto", "all", "none"].includes(extendedModels))
    throw new RangeError(`fitMechanism: extendedModels must be auto, all or none (got ${String(extendedModels)})`);
  if (outliers !== undefined && !["auto", "always", "never"].includes(outliers))
    throw new RangeError(`fitMechanism: outliers must be auto, always or never (got ${String(outliers)})`);
  if (outlierQ !== undefined && !(outlierQ > 0 && outlierQ < 1))
    throw new RangeError(`fitMechanism: outlierQ must be between 0 and 1 (got ${outlierQ})`);
}

/**
 * Fits the four inhibition models to `points`, chooses one, checks adequacy and, when the data
 * call for them, fits and recommends models outside the four (see the file comment).
 * Example (isdals `inhibitor`, see mechanism-fit.test.ts): competitive Vmax 2.9383, Km 33.993,
 * Ki 34.845, chosen over mixed (F-test p = 0.0956), labelled ambiguous (ΔAICc 0.46).
 */
export function fitMechanism(points: readonly MechanismPoint[], options: MechanismOptions = {}): MechanismResult {
  checkOptions(options);
  const requested = options.weighting ?? "none";
  const flags: MechanismFlag[] = [];
  const fragile: string[] = [];

  // --- weighting ---
  let d: Data;
  let weightingChoice: MechanismWeightingChoice;
  let plainFit: StandardFit | null = null;
  if (requested === "auto") {
    const plain = prepare(points, "none");
    const auto = autoWeighting(plain, options.outlierQ ?? DEFAULT_OUTLIER_Q, options.rowNames);
    plainFit = auto.plainFit;
    d = auto.choice.weighting === "relative" ? groupMeanWeighted(plain) : plain;
    weightingChoice = {
      requested,
      used: auto.choice.weighting,
      basis: auto.choice.weighting === "relative" ? "replicate mean" : null,
      reason: auto.reason,
      test: auto.choice,
    };
  } else {
    d = prepare(points, requested);
    weightingChoice = {
      requested,
      used: requested,
      basis: requested === "relative" ? "observed rate" : null,
      reason: requested === "relative" ? "relative weighting as requested" : "unweighted as requested",
      test: null,
    };
  }
  const fit = weightingChoice.used === "none" && plainFit ? plainFit : fitStandard(d);
  const { best, models } = fit;

  // --- does the call depend on the weighting? (cheap test; refit only when noise grows with rate) ---
  let reweighted: Data | null = null;
  if (requested === "none" && mayBeProportional(fit.ctx.replicates)) {
    const test = chooseWeighting(fit.ctx.replicates);
    if (test.weighting === "relative") {
      weightingChoice.test = test;
      reweighted = groupMeanWeighted(d);
      let refit: StandardFit | null = null;
      try {
        refit = fitStandard(reweighted);
      } catch {
        reweighted = null; // without the S = 0 rows too few remain to refit: keep the flag only
      }
      const same = refit === null || refit.best === best;
      const evidence = `Scatter grows with the rate (${slopeText(test)})`;
      flags.push({
        code: same ? "noise-grows-with-rate" : "weighting-sensitive",
        message: same
          ? `${evidence}; relative weighting (weighting "auto") ${refit ? "gives the same call" : "is advised"}.`
          : `${evidence}; with relative weighting the call is ${refit!.best}, not ${best}: use weighting "auto".`,
      });
      if (!same) fragile.push("weighting");
    }
  }

  const judgement = judgeMechanism({
    d,
    ctx: fit.ctx,
    rssFloor: fit.rssFloor,
    best,
    label: fit.label,
    models,
    iRef: fit.iRef,
    sMax: fit.sMax,
    enzymeConc: options.enzymeConc ?? null,
    extendedModels: options.extendedModels ?? "auto",
    fragile,
    ...(options.units ? { units: options.units } : {}),
    unequalScatter: weightingChoice.test?.weighting === "relative" && requested === "none",
  });

  // --- outliers: ROUT on the recommended model (the chosen one when none is adequate), on the
  // weighting the replicates support, only when the cheap screen or the caller asks ---
  let outliers: MechanismOutliers | null = null;
  const mode = options.outliers ?? "auto";
  if (mode !== "never" && fit.raw[best].rss > fit.rssFloor) {
    const target = judgement.recommended?.model ?? best;
    const alt = judgement.alternatives.find((a) => a.model === target);
    const data = reweighted ?? d;
    const e = options.enzymeConc ?? 0;
    const problem = alt ? extendedProblem(alt.model, data, e) : makeProblem(target as InhibitionModel, data);
    const start = alt ? alt.theta : Array.from(fit.raw[target as InhibitionModel].theta);
    const p = problem.nParams;
    const residuals = new Float64Array(data.n);
    problem.evaluate(Float64Array.from(start), residuals, null);
    const scale = rsdr(residuals, p);
    let largest = 0;
    for (let k = 0; k < data.n; k++) largest = Math.max(largest, Math.abs(residuals[k]!));
    const largestStandardized = scale > 0 ? largest / scale : 0;
    const q = options.outlierQ ?? DEFAULT_OUTLIER_Q;
    outliers = {
      checked: "screen",
      model: target,
      largestStandardized,
      indices: [],
      standardized: [],
      pValues: [],
      q,
      callWithout: null,
      kiWithout: null,
    };
    const df = data.n - p;
    const pLargest = df > 0 ? 2 * (1 - studentTCdf(largestStandardized, df)) : 1;
    if (mode === "always" || pLargest <= (OUTLIER_SCREEN_MARGIN * q) / data.n) {
      const rout = findOutliers(problem, start, { q });
      outliers.checked = "rout";
      if (rout.outlierIndices.length > 0) {
        outliers.indices = rout.outlierIndices.map((k) => data.rowIndex[k]!);
        outliers.standardized = rout.outlierIndices.map((k) => rout.standardized[k]!);
        outliers.pValues = rout.outlierIndices.map((k) => rout.pValues[k]!);
        let kiName = "Ki";
        const before = alt ? quotedKiOf(alt.kic.value, alt.kiu.value) : quotedKi(models[target as InhibitionModel]);
        let changed: boolean;
        if (alt) {
          // The extended model refitted without the outliers (ROUT's own ordinary refit).
          const k = extendedConstants(alt.model, rout.fit.theta);
          outliers.callWithout = alt.model;
          outliers.kiWithout = finiteOrNull(quotedKiOf(k.kic, k.kiu));
          kiName = k.kic !== null && Number.isFinite(k.kic) ? "Kic" : "Kiu";
          changed = kiMoved(before, outliers.kiWithout);
        } else {
          let refit: StandardFit | null = null;
          try {
            refit = fitStandard(without(data, new Set(rout.outlierIndices)));
          } catch {
            refit = null; // too few rows left to compare the models: report the proposal alone
          }
          outliers.callWithout = refit?.best ?? null;
          outliers.kiWithout = refit ? finiteOrNull(quotedKi(refit.models[refit.best])) : null;
          if (refit) kiName = refit.models[refit.best].kic !== null ? "Kic" : "Kiu";
          changed = !refit || refit.best !== target || kiMoved(before, outliers.kiWithout);
        }
        const rows = rowsText(outliers.indices, options.rowNames);
        const after =
          outliers.callWithout !== null
            ? `without ${outliers.indices.length > 1 ? "them" : "it"} the call is ${outliers.callWithout}, ${kiName} ${concText(outliers.kiWithout, options.units, 3)}`
            : "too few rows would remain to refit";
        flags.push({
          code: "outliers-proposed",
          message: `${rows.charAt(0).toUpperCase()}${rows.slice(1)} ${outliers.indices.length > 1 ? "look like outliers" : "looks like an outlier"} of the ${target} fit (ROUT, Q = ${100 * q} %); ${after}. Nothing was removed: a scientist accepts or rejects the proposal.`,
        });
        if (changed) {
          // The call rests on wells a scientist may reject: it cannot be "clear".
          if (judgement.label === "clear") judgement.label = "ambiguous";
          if (judgement.recommended) judgement.recommended.label = "ambiguous";
        }
      }
    }
  }

  return {
    best,
    label: judgement.label,
    models,
    n: d.n,
    weighting: weightingChoice.used,
    weightingChoice,
    recommended: judgement.recommended,
    alternatives: judgement.alternatives,
    screens: judgement.screens,
    flags: [...judgement.flags, ...flags],
    outliers,
  };
}

function summarise(
  model: InhibitionModel,
  f: RawFit,
  n: number,
  aiccValue: number,
  delta: number,
  weight: number,
  fTest: FTestResult | null,
  adequacy: MechanismAdequacy,
): MechanismModelFit {
  const p = MODEL_PARAMETER_COUNT[model];
  const dof = n - p;
  const [vmax, km, a, b] = unpack(model, f.theta);
  const se = (k: number): number | null => {
    if (!f.cov) return null;
    const v = f.cov[k * p + k]!;
    return v >= 0 && Number.isFinite(v) ? Math.sqrt(v) : null;
  };
  const seV = se(0);
  const seKm = se(1);
  const seA = model === "uncompetitive" ? null : se(2);
  const seB = model === "competitive" ? null : model === "mixed" ? se(3) : se(2);
  const none = { value: null, se: null, ci95: [null, null] as Interval };
  const kic = model === "uncompetitive" ? none : reciprocalConstant(a, seA, dof);
  const kiu = model === "competitive" ? none : model === "noncompetitive" ? kic : reciprocalConstant(b, seB, dof);
  let alpha: number | null;
  if (model === "competitive") alpha = null;
  else if (model === "uncompetitive") alpha = 0;
  else if (model === "noncompetitive") alpha = 1;
  else alpha = b > 0 ? finiteOrNull(a / b) : null;
  return {
    model,
    nParams: p,
    vmax,
    km,
    kic: kic.value,
    kiu: kiu.value,
    alpha,
    a,
    b,
    se: { vmax: seV, km: seKm, kic: kic.se, kiu: kiu.se, a: seA, b: seB },
    ci95: { vmax: waldInterval95(vmax, seV, dof), km: waldInterval95(km, seKm, dof), kic: kic.ci95, kiu: kiu.ci95 },
    rss: f.rss,
    aicc: aiccValue,
    deltaAicc: delta,
    akaikeWeight: weight,
    fTestVsMixed: fTest,
    dof,
    converged: f.converged,
    adequacy,
  };
}
