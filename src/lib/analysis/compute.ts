/**
 * From well readings of accepted plate runs to per-compound results: the pure part of the
 * analysis pipeline (no I/O). The server loads readings, calls these, and stores the results.
 *
 * - Single-dose: % inhibition of each compound pooled over its wells on every plate (mean, SD,
 *   n), hit call by the campaign's rule (kinetics/hit-calling).
 * - Dose-response: the engine's judgement of each curve (kinetics/dose-response: outcome
 *   fitted / inactive / activator / not determined, weighting, adequacy, proposed outliers) on
 *   % inhibition pooled over plates, plus tight binding (Morrison fit when the enzyme
 *   concentration is known) and a baseline-offset flag.
 * - Mechanism: the global fit of initial rates against [S] and [I] (kinetics/mechanism-fit: the
 *   four standard models with their adequacy, the models beyond them the data call for, the
 *   recommended model, weighting, proposed outliers), Ki of the recommended model with its 95 % CI.
 * The `analyze` command calls the same per-compound functions, so it reports what the app stores.
 * Concentrations are µM throughout. Results are for research use and need review by a
 * qualified scientist.
 */
import { callHits, type HitRule } from "@/lib/kinetics/hit-calling";
import type { InhibitionModel } from "@/lib/kinetics/inhibition-models";
import type { Logistic4Fit } from "@/lib/kinetics/logistic4";
import { fitMorrison } from "@/lib/kinetics/morrison";
import {
  analyseCurve,
  type CurveAnalysis,
  type CurveJudgement,
  type ResponseScale,
} from "@/lib/kinetics/dose-response";
import {
  fitMechanism,
  type MechanismModelFit,
  type MechanismResult,
  type MechanismWeightingChoice,
} from "@/lib/kinetics/mechanism-fit";
import type { ExtendedModelFit } from "@/lib/kinetics/mechanism-models";
import type { Estimate } from "@/lib/kinetics/mechanism-models";
import { DEFAULT_ANALYSIS_WEIGHTING, OUTLIER_Q, type AnalysisWeighting } from "./settings";
import type {
  AdequacySummary,
  AlternativeModel,
  DoseResponseCalledDetail,
  DoseResponseFittedDetail,
  MechanismFittedDetail,
  ModelSummary,
  ResultDetail,
  WeightingDecision,
} from "./detail";
import { headlineKi } from "./headline-ki";

export type AnalysisReading = {
  runId: string;
  well: string;
  role: "sample" | "neutral" | "full" | "blank" | "empty";
  compoundId: string | null;
  concentrationUm: number | null;
  substrateUm: number | null;
  /** endpoint value, or initial rate for kinetic runs */
  signal: number | null;
  inhibitionPct: number | null;
  masked: boolean;
};

export type CompoundResult = {
  compoundId: string;
  nPoints: number;
  pctInhibition?: number | null;
  pctInhibitionSd?: number | null;
  hit?: boolean | null;
  ic50Um?: number | null;
  ic50LoUm?: number | null;
  ic50HiUm?: number | null;
  /** ">" or "<" when the IC50 lies outside the tested range (reported as the range end). */
  ic50Qualifier?: ">" | "<" | null;
  hill?: number | null;
  mechanism?: InhibitionModel | null;
  mechanismLabel?: "clear" | "ambiguous" | "inadequate" | null;
  kiUm?: number | null;
  kiLoUm?: number | null;
  kiHiUm?: number | null;
  kicUm?: number | null;
  kiuUm?: number | null;
  alpha?: number | null;
  flags: string[];
  detail: ResultDetail;
};

/**
 * x to `digits` significant digits, as Number(x.toPrecision(digits)) gives it, so stored figures
 * do not carry the last bits of floating-point noise. toPrecision costs about half a microsecond,
 * and a batch of 10⁴ curves rounds some 3·10⁵ figures, so the common magnitudes take the integer
 * path: with 10^p exact (p ≤ 22) the quotient Math.round(x·10^p)/10^p is the double nearest the
 * rounded decimal, which is what toPrecision's string parses to (ties aside).
 */
function roundFinite(x: number, digits = 10): number {
  if (x === 0) return 0;
  const p = digits - 1 - Math.floor(Math.log10(Math.abs(x)));
  if (p < 0 || p > 22) return Number(x.toPrecision(digits));
  const f = POW10[p]!;
  return Math.round(x * f) / f;
}
const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k);
const round = (x: number | null | undefined, digits = 10): number | null =>
  x === null || x === undefined || !Number.isFinite(x) ? null : roundFinite(x, digits);

function meanSd(xs: number[]): { mean: number; sd: number | null } {
  const n = xs.length;
  const mean = xs.reduce((a, b) => a + b, 0) / n;
  if (n < 2) return { mean, sd: null };
  const v = xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1);
  return { mean, sd: Math.sqrt(v) };
}

/** Sample wells of each compound, unmasked, in a stable order (compound, run, well). */
function byCompound(readings: readonly AnalysisReading[]): Map<string, AnalysisReading[]> {
  const m = new Map<string, AnalysisReading[]>();
  for (const r of readings) {
    if (r.role !== "sample" || r.masked || !r.compoundId) continue;
    const list = m.get(r.compoundId) ?? [];
    list.push(r);
    m.set(r.compoundId, list);
  }
  for (const list of m.values())
    list.sort((a, b) => (a.runId === b.runId ? a.well.localeCompare(b.well) : a.runId.localeCompare(b.runId)));
  return new Map([...m.entries()].sort(([a], [b]) => a.localeCompare(b)));
}

// ---------------------------------------------------------------------------------------------
// Single-dose

export function analyseSingleDose(
  readings: readonly AnalysisReading[],
  rule: HitRule,
): { results: CompoundResult[]; threshold: number | null } {
  const groups = byCompound(readings);
  const neutralPct = readings
    .filter((r) => r.role === "neutral" && !r.masked && r.inhibitionPct !== null)
    .map((r) => r.inhibitionPct!);
  const rows: { id: string; mean: number; sd: number | null; n: number; concs: number[] }[] = [];
  for (const [id, list] of groups) {
    const values = list.map((r) => r.inhibitionPct).filter((x): x is number => x !== null && Number.isFinite(x));
    if (values.length === 0) continue;
    const { mean, sd } = meanSd(values);
    rows.push({ id, mean, sd, n: values.length, concs: [...new Set(list.map((r) => r.concentrationUm ?? NaN))] });
  }
  let threshold: number | null = null;
  let hits: boolean[] = rows.map(() => false);
  if (rows.length > 0) {
    const usable = rule.kind === "percent" || neutralPct.length >= 2;
    const effective: HitRule = usable ? rule : { kind: "percent", thresholdPercent: 50 };
    const call = callHits(
      rows.map((r) => r.mean),
      effective,
      neutralPct,
    );
    threshold = call.threshold;
    hits = call.isHit;
  }
  const results = rows.map((r, k): CompoundResult => {
    const flags: string[] = [];
    if (r.n < 2) flags.push("single-well");
    if (r.sd !== null && r.sd > 20) flags.push("replicates-disagree");
    return {
      compoundId: r.id,
      nPoints: r.n,
      pctInhibition: round(r.mean),
      pctInhibitionSd: round(r.sd),
      hit: hits[k] ?? false,
      flags,
      detail: { thresholdPct: round(threshold), rule, concentrationsUm: r.concs.filter(Number.isFinite) },
    };
  });
  return { results, threshold };
}

// ---------------------------------------------------------------------------------------------
// Dose-response

export type DoseResponseOptions = {
  fixTopPct?: number | null;
  fixBottomPct?: number | null;
  /** Enzyme concentration in the assay, µM; enables the tight-binding check and Morrison fit. */
  enzymeUm?: number | null;
  /** "auto" (default) decides from the replicate wells; see ANALYSIS_WEIGHTINGS. */
  weighting?: AnalysisWeighting;
  /** Report the fit without the proposed outliers (default: they are only proposed). */
  robust?: boolean;
  /**
   * What `inhibitionPct` holds: % inhibition (default; the pipeline), or, for the command only,
   * % activity or a raw signal.
   */
  response?: DoseResponseScale;
  /**
   * The sentences' wording: the concentration unit they name ("µM"), and whether outlier
   * sentences name the points by their wells. The engine is unit-agnostic: bare numbers without it.
   */
  wording?: { concentrationUnit: string; wells: boolean };
};

export type DoseResponseScale = ResponseScale;

/** One well of a dose-response series: concentration µM, % inhibition, and where it was read. */
export type DoseResponsePoint = { concentrationUm: number; inhibitionPct: number; runId: string; well: string };

/**
 * The IC50 as reported: inside the tested range as fitted; beyond it (the 4PL's range flags, or
 * a curve whose IC50 lies below the lowest concentration) as the range end with ">" or "<".
 */
function ic50Summary(ic50: number | null, flags: readonly string[], rangeUm: [number, number]) {
  if (flags.includes("ic50-above-range")) return { ic50: rangeUm[1], qualifier: ">" as const };
  if (flags.includes("ic50-below-range")) return { ic50: rangeUm[0], qualifier: "<" as const };
  return { ic50, qualifier: null };
}

function logistic4Detail(fit: Logistic4Fit): DoseResponseFittedDetail["fit"] {
  return {
    ic50Um: round(fit.ic50),
    log10Ic50: round(fit.log10Ic50),
    log10Ic50Se: round(fit.log10Ic50Se),
    ic50Ci95Um: [round(fit.ic50Ci95[0]), round(fit.ic50Ci95[1])],
    hill: round(fit.hill),
    hillSe: round(fit.hillSe),
    direction: fit.direction,
    topPct: round(fit.top),
    bottomPct: round(fit.bottom),
    rss: round(fit.rss),
    rSquared: round(fit.rSquared),
    dof: fit.dof,
    converged: fit.converged,
  };
}

function adequacyDetail(a: CurveJudgement["adequacy"] | MechanismModelFit["adequacy"] | null): AdequacySummary | null {
  if (!a) return null;
  return {
    lackOfFit: a.lackOfFit
      ? { f: round(a.lackOfFit.f), p: round(a.lackOfFit.p), dfLof: a.lackOfFit.dfLof, dfPe: a.lackOfFit.dfPe }
      : null,
    runs: { runs: a.runs.runs, expected: roundFinite(a.runs.expected), p: round(a.runs.p) },
    adequate: a.adequate,
    reasons: [...a.reasons],
  };
}

/** [lowest, highest] concentration above 0 (null when there is none). */
function testedRange(x: readonly number[]): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of x)
    if (c > 0) {
      if (c < lo) lo = c;
      if (c > hi) hi = c;
    }
  return hi > 0 ? [lo, hi] : null;
}

function outliersDetail(
  c: CurveAnalysis,
  x: readonly number[],
  y: readonly number[],
  where: (k: number) => readonly [string, string],
  q: number,
): DoseResponseCalledDetail["outliers"] {
  if (c.outliers.length === 0) return null;
  const other = c.alternative;
  return {
    q,
    proposed: c.outliers.map((o) => {
      const [runId, well] = where(o.index);
      return {
        runId,
        well,
        concentrationUm: x[o.index]!,
        inhibitionPct: roundFinite(y[o.index]!),
        residual: round(c.robustScale ? o.residual / c.robustScale : null),
        p: round(o.p),
      };
    }),
    reported: c.reported === "outliers-excluded" ? "without-outliers" : "all-points",
    other: other
      ? {
          basis: other.basis === "outliers-excluded" ? "without-outliers" : "all-points",
          outcome: other.outcome,
          reason: other.reason ?? null,
          fit: other.fit ? logistic4Detail(other.fit) : null,
        }
      : null,
  };
}

/**
 * One compound's dose-response result from its wells (pooled over plates): the pipeline and the
 * `analyze` command both call this, so they report the same outcome, flags and figures. An
 * inactive, activating or undetermined curve gets no IC50 (`ic50Um` null) and says why.
 */
export function analyseDoseResponseCompound(
  compoundId: string,
  pts: readonly DoseResponsePoint[],
  opts: DoseResponseOptions = {},
): CompoundResult {
  return analyseDoseResponseSeries(
    compoundId,
    pts.map((p) => p.concentrationUm),
    pts.map((p) => p.inhibitionPct),
    (k) => [pts[k]!.runId, pts[k]!.well],
    opts,
  );
}

/**
 * analyseDoseResponseCompound on arrays: concentrations `x` µM, % inhibition `y`, and where
 * point k was read (run id, well). `omitPoints` leaves the detail's point list empty, for the
 * command, which does not print it (a batch of 10⁴ curves would build 10⁵ small arrays for nothing).
 */
export function analyseDoseResponseSeries(
  compoundId: string,
  x: readonly number[],
  y: readonly number[],
  where: (k: number) => readonly [string, string],
  opts: DoseResponseOptions & { omitPoints?: boolean } = {},
): CompoundResult {
  const q = OUTLIER_Q;
  const requested = opts.weighting ?? DEFAULT_ANALYSIS_WEIGHTING;
  const c = analyseCurve(x, y, {
    weighting: requested,
    robust: opts.robust ?? false,
    q,
    ...(opts.response ? { response: opts.response } : {}),
    ...(opts.fixTopPct !== null && opts.fixTopPct !== undefined ? { fixedTop: opts.fixTopPct } : {}),
    ...(opts.fixBottomPct !== null && opts.fixBottomPct !== undefined ? { fixedBottom: opts.fixBottomPct } : {}),
    ...(opts.wording ? { units: { concentration: opts.wording.concentrationUnit } } : {}),
    ...(opts.wording?.wells ? { rowNames: Array.from(x, (_, k) => where(k)[1]) } : {}),
  });
  const weighting: WeightingDecision = {
    used: c.weighting.used,
    chosen: c.weighting.chosen,
    reason: c.weighting.reason,
  };
  const rangeUm = testedRange(x);
  const maxInhibitionPct = round(c.maxInhibitionPct ?? null);
  const outliers = outliersDetail(c, x, y, where, q);
  const points: [number, number, string, string][] = [];
  if (!opts.omitPoints)
    for (let k = 0; k < x.length; k++) {
      const [runId, well] = where(k);
      points.push([x[k]!, roundFinite(y[k]!), runId, well]);
    }

  if (c.outcome !== "fitted" || !c.fit || !rangeUm) {
    const tooFew = c.flags.includes("too-few-points");
    // "too-few-points" alone keeps the record of old; otherwise the outcome is a flag of its own.
    const flags = [...new Set<string>(tooFew ? c.flags : [c.outcome, ...c.flags])];
    // A curve at ≥ 50 % everywhere has its IC50 below the range: kept as a bound for ranking.
    const bound =
      c.outcome === "not-determined" && rangeUm ? ic50Summary(null, c.flags, rangeUm) : { ic50: null, qualifier: null };
    const detail: DoseResponseCalledDetail = {
      outcome: c.outcome === "fitted" ? "not-determined" : c.outcome,
      reason: c.reason ?? "no IC50 could be determined",
      maxInhibitionPct,
      testedRangeUm: rangeUm,
      curve: null,
      adequacy: adequacyDetail(c.adequacy),
      weighting,
      outliers,
      points,
    };
    if (c.maxActivationPct !== undefined) detail.maxActivationPct = round(c.maxActivationPct);
    if (c.ic50Bracket) detail.ic50BracketUm = c.ic50Bracket;
    return {
      compoundId,
      nPoints: x.length,
      ic50Um: bound.ic50,
      ic50LoUm: null,
      ic50HiUm: null,
      ic50Qualifier: bound.qualifier,
      hill: null,
      flags,
      detail,
    };
  }

  const fit = c.fit;
  const flags: string[] = [...c.flags];
  const s = ic50Summary(fit.ic50, fit.flags, rangeUm);
  if (fit.bottom !== null && Math.abs(fit.bottom) > 20 && opts.response !== "signal") flags.push("baseline-offset");
  const morrison = tightBindingCheck(fit, c.usedIndices, x, y, opts, flags);
  return {
    compoundId,
    nPoints: x.length,
    ic50Um: round(s.ic50),
    ic50LoUm: s.qualifier ? null : round(fit.ic50Ci95[0]),
    ic50HiUm: s.qualifier ? null : round(fit.ic50Ci95[1]),
    ic50Qualifier: s.qualifier,
    hill: round(fit.hill),
    flags: [...new Set(flags)],
    detail: {
      outcome: "fitted",
      fit: logistic4Detail(fit),
      testedRangeUm: rangeUm,
      fixed: { topPct: opts.fixTopPct ?? null, bottomPct: opts.fixBottomPct ?? null },
      morrison,
      maxInhibitionPct,
      adequacy: adequacyDetail(c.adequacy),
      weighting,
      outliers,
      points,
    },
  };
}

/**
 * Tight binding suspected (IC50 < 10·[E] or Hill > 2, common practice): the Morrison equation is
 * fitted with the known enzyme concentration (Morrison 1969; IC50 = K′ + E/2, Copeland et al.
 * 1995) and the flag is added. Needs % inhibition (activity = 1 − % / 100).
 */
function tightBindingCheck(
  fit: Logistic4Fit,
  used: readonly number[],
  xAll: readonly number[],
  yAll: readonly number[],
  opts: DoseResponseOptions,
  flags: string[],
): DoseResponseFittedDetail["morrison"] {
  const e = opts.enzymeUm ?? null;
  if (!e || !(e > 0) || fit.ic50 === null) return null;
  const steep = fit.hill !== null && fit.hill > 2;
  if (!(fit.ic50 < 10 * e || steep)) return null;
  flags.push("tight-binding-suspected");
  if (opts.response === "signal")
    return { error: "the Morrison fit needs % inhibition or % activity, not a raw signal" };
  // The points of the reported fit (without the outliers when robust left them out).
  const x = used.map((k) => xAll[k]!);
  const v = used.map((k) => (opts.response === "activity-pct" ? yAll[k]! / 100 : 1 - yAll[k]! / 100));
  try {
    const m = fitMorrison(x, v, e, { fixedV0: 1 });
    return {
      enzymeUm: e,
      kAppUm: round(m.kApp),
      kAppCi95Um: [round(m.kAppCi95[0]), round(m.kAppCi95[1])],
      ic50Um: round(m.ic50),
      rss: round(m.rss),
      converged: m.converged,
    };
  } catch (err) {
    return { error: err instanceof Error ? err.message : String(err) };
  }
}

export function analyseDoseResponse(
  readings: readonly AnalysisReading[],
  opts: DoseResponseOptions = {},
): CompoundResult[] {
  const out: CompoundResult[] = [];
  for (const [id, list] of byCompound(readings)) {
    const pts: DoseResponsePoint[] = [];
    for (const r of list)
      if (r.concentrationUm !== null && r.inhibitionPct !== null && Number.isFinite(r.inhibitionPct))
        pts.push({ concentrationUm: r.concentrationUm, inhibitionPct: r.inhibitionPct, runId: r.runId, well: r.well });
    // The app's concentrations are µM and its points wells: the sentences say so.
    out.push(analyseDoseResponseCompound(id, pts, { wording: { concentrationUnit: "µM", wells: true }, ...opts }));
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Mechanism

export type MechanismAnalysisOptions = {
  /** "auto" (default) decides from the replicate wells; see ANALYSIS_WEIGHTINGS. */
  weighting?: AnalysisWeighting;
  /** Enzyme concentration in the assay, µM (same unit as the inhibitor): the tight-binding check. */
  enzymeUm?: number | null;
  /** Report the fit without the proposed outliers (default: they are only proposed). */
  robust?: boolean;
  /**
   * How the sentences (flags, reasons, meanings) word numbers and rows: the concentration unit and
   * whether rows are named by their well. The pipeline's concentrations are µM and its rows wells;
   * the command, whose file may use any unit, leaves them out (bare numbers, "row k").
   */
  wording?: { concentrationUnit: string; wells: boolean };
};

/** One well of a mechanism study: [S] and [I] µM, background-corrected rate, where it was read. */
export type MechanismInputPoint = { substrate: number; inhibitor: number; rate: number; runId: string; well: string };

function modelSummary(m: MechanismModelFit): ModelSummary {
  const ci = (v: [number | null, number | null]): [number | null, number | null] => [round(v[0]), round(v[1])];
  return {
    vmax: round(m.vmax),
    kmUm: round(m.km),
    kicUm: round(m.kic),
    kiuUm: round(m.kiu),
    alpha: round(m.alpha),
    se: {
      vmax: round(m.se.vmax),
      km: round(m.se.km),
      kic: round(m.se.kic),
      kiu: round(m.se.kiu),
      a: round(m.se.a),
      b: round(m.se.b),
    },
    ci95: { vmax: ci(m.ci95.vmax), km: ci(m.ci95.km), kic: ci(m.ci95.kic), kiu: ci(m.ci95.kiu) },
    rss: round(m.rss),
    aicc: round(m.aicc),
    deltaAicc: round(m.deltaAicc),
    akaikeWeight: round(m.akaikeWeight),
    fTestVsMixedP: round(m.fTestVsMixed?.p ?? null),
    fTestVsMixedF: round(m.fTestVsMixed?.f ?? null),
    dof: m.dof,
    converged: m.converged,
    adequacy: adequacyDetail(m.adequacy),
  };
}

/** The four models' summaries, keyed by model. */
function modelSummaries(fit: MechanismResult): MechanismFittedDetail["models"] {
  return {
    competitive: modelSummary(fit.models.competitive),
    uncompetitive: modelSummary(fit.models.uncompetitive),
    noncompetitive: modelSummary(fit.models.noncompetitive),
    mixed: modelSummary(fit.models.mixed),
  };
}

const FAMILY_NAMES: Record<ExtendedModelFit["family"], string> = {
  "substrate-inhibition": "with substrate inhibition",
  partial: "partial",
  "tight-binding": "tight-binding",
};

/** "partial mixed inhibition", "competitive inhibition with substrate inhibition", … */
function alternativeName(a: ExtendedModelFit): string {
  if (a.family === "substrate-inhibition") return `${a.mechanism} inhibition ${FAMILY_NAMES[a.family]}`;
  return `${FAMILY_NAMES[a.family]} ${a.mechanism} inhibition`;
}

function estimate(e: Estimate, unit: string): AlternativeModel["constants"][string] {
  const out: AlternativeModel["constants"][string] = {
    value: round(e.value),
    se: round(e.se),
    ci95: [round(e.ci95[0]), round(e.ci95[1])] as [number | null, number | null],
    unit,
  };
  if (e.fixed) out.fixed = true;
  return out;
}

function alternativeDetail(a: ExtendedModelFit): AlternativeModel {
  const constants: AlternativeModel["constants"] = {
    vmax: estimate(a.vmax, "rate"),
    kmUm: estimate(a.km, "µM"),
  };
  if (
    a.kic.value !== null ||
    a.mechanism === "competitive" ||
    a.mechanism === "mixed" ||
    a.mechanism === "noncompetitive"
  )
    constants.kicUm = estimate(a.kic, "µM");
  if (a.mechanism !== "competitive" && a.mechanism !== "noncompetitive") constants.kiuUm = estimate(a.kiu, "µM");
  if (a.ksi) constants.ksiUm = estimate(a.ksi, "µM");
  if (a.beta) constants.beta = estimate(a.beta, "");
  const out: AlternativeModel = {
    model: a.model,
    name: alternativeName(a),
    constants,
    rss: round(a.rss),
    aicc: round(a.aicc),
    deltaAicc: round(a.deltaAicc),
    dof: a.dof,
    converged: a.converged,
    adequacy: adequacyDetail(a.adequacy),
    exclusion: a.exclusion,
    meaning: a.sentence,
  };
  if (a.residualActivity !== null) out.residualActivity = round(a.residualActivity);
  if (a.enzymeConc !== null) out.enzymeUm = round(a.enzymeConc);
  return out;
}

function weightingDetail(w: MechanismWeightingChoice): WeightingDecision {
  return { used: w.used, chosen: w.requested === "auto" ? "auto" : "set", reason: w.reason };
}

/** α = Kiu/Kic as the mechanism defines it: null competitive, 0 uncompetitive, 1 noncompetitive. */
function alphaOf(mechanism: InhibitionModel, kic: number | null, kiu: number | null): number | null {
  if (mechanism === "competitive") return null;
  if (mechanism === "uncompetitive") return 0;
  if (mechanism === "noncompetitive") return 1;
  return kic !== null && kiu !== null && kic > 0 ? kiu / kic : null;
}

/**
 * The constants a result stands for: the recommended model's (one of the four, or a model beyond
 * them — its Ki is then the trustworthy one), else the standard choice's when no model is adequate.
 */
export function summariseMechanism(fit: MechanismResult, chosen?: InhibitionModel) {
  const rec = chosen === undefined ? fit.recommended : null;
  const mechanism = chosen ?? rec?.mechanism ?? fit.best;
  const std = fit.models[mechanism];
  const kic = rec ? rec.kic : { value: std.kic, ci95: std.ci95.kic };
  const kiu = rec ? rec.kiu : { value: std.kiu, ci95: std.ci95.kiu };
  const { kiUm: ki, ci95: ci } = headlineKi(mechanism, {
    kicUm: kic.value,
    kiuUm: kiu.value,
    ci95: { kic: kic.ci95, kiu: kiu.ci95 },
  });
  return {
    mechanism,
    label: fit.label,
    kiUm: round(ki),
    kiCi95Um: [round(ci[0]), round(ci[1])] as [number | null, number | null],
    kicUm: round(kic.value),
    kiuUm: round(kiu.value),
    alpha: round(rec && rec.family !== "standard" ? alphaOf(mechanism, kic.value, kiu.value) : std.alpha),
    vmax: round(std.vmax),
    kmUm: round(std.km),
  };
}

function mechanismOutliersDetail(
  fit: MechanismResult,
  pts: readonly MechanismInputPoint[],
  reported: "all-points" | "without-outliers",
): MechanismFittedDetail["outliers"] {
  const o = fit.outliers;
  if (!o) return null;
  return {
    checked: o.checked,
    largestStandardized: round(o.largestStandardized),
    model: o.model,
    q: o.q,
    proposed: o.indices.map((k, j) => {
      const p = pts[k]!;
      return {
        runId: p.runId,
        well: p.well,
        substrateUm: p.substrate,
        inhibitorUm: p.inhibitor,
        rate: roundFinite(p.rate),
        residual: round(o.standardized[j] ?? null),
        p: round(o.pValues[j] ?? null),
      };
    }),
    reported,
    callWithout: o.callWithout,
    kiWithoutUm: round(o.kiWithout),
  };
}

/**
 * One compound's mechanism result from its wells: the pipeline and the `analyze` command both
 * call this, so they report the same label, models and flags. With `robust` on and outliers
 * proposed, the fit without them is the one reported (the proposals stay listed).
 */
export function analyseMechanismCompound(
  compoundId: string,
  pts: readonly MechanismInputPoint[],
  opts: MechanismAnalysisOptions = {},
): CompoundResult {
  const levelsS = new Set(pts.map((p) => p.substrate)).size;
  const levelsI = new Set(pts.map((p) => p.inhibitor)).size;
  if (pts.length < 6 || levelsS < 3 || levelsI < 2) {
    return {
      compoundId,
      nPoints: pts.length,
      flags: ["too-few-points"],
      detail: {
        reason: `needs at least 6 wells at 3 substrate and 2 inhibitor concentrations (has ${pts.length} wells at ${levelsS} and ${levelsI})`,
        points: [...pts],
      },
    };
  }
  const e = opts.enzymeUm ?? null;
  const options = {
    weighting: opts.weighting ?? DEFAULT_ANALYSIS_WEIGHTING,
    ...(e !== null && e > 0 ? { enzymeConc: e } : {}),
    outliers: opts.robust ? ("always" as const) : ("auto" as const),
    outlierQ: OUTLIER_Q,
    ...(opts.wording ? { units: { concentration: opts.wording.concentrationUnit } } : {}),
    ...(opts.wording?.wells ? { rowNames: pts.map((p) => p.well) } : {}),
  };
  let fit: MechanismResult;
  let used = pts;
  let reported: "all-points" | "without-outliers" = "all-points";
  try {
    fit = fitMechanism(pts, options);
    const drop = fit.outliers?.indices ?? [];
    if (opts.robust && drop.length > 0) {
      const out = new Set(drop);
      const kept = pts.filter((_, k) => !out.has(k));
      const without = fitMechanism(kept, {
        ...options,
        ...(options.rowNames ? { rowNames: kept.map((p) => p.well) } : {}),
        outliers: "never",
      });
      // The proposals (indices into all points) stay with the reported fit.
      fit = { ...without, outliers: fit.outliers };
      used = kept;
      reported = "without-outliers";
    }
  } catch (err) {
    return {
      compoundId,
      nPoints: pts.length,
      flags: ["fit-failed"],
      detail: { error: err instanceof Error ? err.message : String(err), points: [...pts] },
    };
  }
  const s = summariseMechanism(fit);
  const flags: string[] = [];
  if (fit.label === "ambiguous") flags.push("ambiguous-mechanism");
  if (fit.label === "inadequate") flags.push("mechanism-inadequate");
  for (const f of fit.flags) flags.push(f.code);
  if (reported === "without-outliers") flags.push("outliers-excluded");
  if (!fit.models[fit.best].converged) flags.push("not-converged");
  if (s.kiCi95Um[0] !== null && s.kiCi95Um[1] !== null && s.kiCi95Um[1] / Math.max(s.kiCi95Um[0], 1e-300) > 10)
    flags.push("ki-ci-wider-than-10-fold");
  if (s.kiCi95Um[1] === null) flags.push("ki-ci-unbounded");
  const maxI = Math.max(...used.map((p) => p.inhibitor));
  if (s.kiUm !== null && s.kiUm > 3 * maxI) flags.push("ki-above-tested-range");
  const sc = fit.screens;
  return {
    compoundId,
    nPoints: pts.length,
    mechanism: s.mechanism,
    mechanismLabel: s.label,
    kiUm: s.kiUm,
    kiLoUm: s.kiCi95Um[0],
    kiHiUm: s.kiCi95Um[1],
    kicUm: s.kicUm,
    kiuUm: s.kiuUm,
    alpha: s.alpha,
    flags: [...new Set(flags)],
    detail: {
      best: fit.best,
      label: fit.label,
      labelReasons: fit.flags.map((f) => f.message),
      n: fit.n,
      weighting: fit.weighting,
      weightingDecision: weightingDetail(fit.weightingChoice),
      models: modelSummaries(fit),
      alternatives: fit.alternatives.map(alternativeDetail),
      ...(fit.recommended ? { recommended: fit.recommended.model } : {}),
      recommendedReason: fit.recommended?.reason ?? "no model fits these data adequately",
      enzymeUm: round(e),
      outliers: mechanismOutliersDetail(fit, pts, reported),
      screens: {
        substrateInhibition: {
          scoreP: round(sc.substrateInhibition.scoreP),
          ratesFall: sc.substrateInhibition.ratesFall,
        },
        partial: { scoreP: round(sc.partial.scoreP) },
        tightBinding: sc.tightBinding
          ? {
              enzymeUm: round(sc.tightBinding.enzymeConc),
              kiMinUm: round(sc.tightBinding.kiMin),
              kiOverEnzyme: round(sc.tightBinding.kiOverEnzyme),
              near: sc.tightBinding.near,
            }
          : null,
        fitted: sc.fitted.map((f) => ({ family: f.family, why: f.why })),
      },
      points: pts.map((p) => [p.substrate, p.inhibitor, round(p.rate), p.runId, p.well]),
      backgroundSubtracted: false,
    },
  };
}

export function analyseMechanism(
  readings: readonly AnalysisReading[],
  opts: MechanismAnalysisOptions = {},
): CompoundResult[] {
  // Background: the mean rate of blank wells on each run, when there are any.
  const blanks = new Map<string, number[]>();
  for (const r of readings)
    if (r.role === "blank" && !r.masked && r.signal !== null)
      blanks.set(r.runId, [...(blanks.get(r.runId) ?? []), r.signal]);
  const background = new Map([...blanks.entries()].map(([k, v]) => [k, v.reduce((a, b) => a + b, 0) / v.length]));

  const out: CompoundResult[] = [];
  for (const [id, list] of byCompound(readings)) {
    const pts: MechanismInputPoint[] = list
      .filter((r) => r.substrateUm !== null && r.signal !== null && Number.isFinite(r.signal))
      .map((r) => ({
        substrate: r.substrateUm!,
        inhibitor: r.concentrationUm ?? 0,
        rate: r.signal! - (background.get(r.runId) ?? 0),
        runId: r.runId,
        well: r.well,
      }));
    // Readings carry µM concentrations and well names: the sentences say so.
    const result = analyseMechanismCompound(id, pts, { wording: { concentrationUnit: "µM", wells: true }, ...opts });
    // (not isFittedMechanism: a runtime import of detail.ts would pull zod into the command's bundle)
    if ("models" in result.detail) result.detail.backgroundSubtracted = background.size > 0;
    out.push(result);
  }
  return out;
}
