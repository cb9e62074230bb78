/**
 * From well readings of accepted plate runs to per-compound results: the pure part of the
 * analysis pipeline (no I/O). The server loads readings, calls these, and stores the results.
 *
 * - Single-dose: % inhibition of each compound pooled over its wells on every plate (mean, SD,
 *   n), hit call by the campaign's rule (kinetics/hit-calling).
 * - Dose-response: a four-parameter logistic fit of % inhibition against concentration, pooled
 *   over plates (kinetics/logistic4), with the engine's flags plus partial inhibition and
 *   tight binding (Morrison fit when the enzyme concentration is known).
 * - Mechanism: the four-model global fit of initial rates against [S] and [I]
 *   (kinetics/mechanism-fit), Ki of the chosen model with its 95 % CI.
 * Concentrations are µM throughout. Results are for research use and need review by a
 * qualified scientist.
 */
import {
  callHits,
  chooseWeighting,
  fitLogistic4,
  fitMechanism,
  fitMorrison,
  type HitRule,
  type InhibitionModel,
  type Logistic4Fit,
  type MechanismModelFit,
  type MechanismResult,
} from "@/lib/kinetics";
import { DEFAULT_ANALYSIS_WEIGHTING, type AnalysisWeighting } from "@/lib/validation/experiments";
import {
  isFittedMechanism,
  type DoseResponseFittedDetail,
  type MechanismFittedDetail,
  type ModelSummary,
  type ResultDetail,
  type WeightingDecision,
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
  mechanismLabel?: "clear" | "ambiguous" | null;
  kiUm?: number | null;
  kiLoUm?: number | null;
  kiHiUm?: number | null;
  kicUm?: number | null;
  kiuUm?: number | null;
  alpha?: number | null;
  flags: string[];
  detail: ResultDetail;
};

const round = (x: number | null | undefined, digits = 10): number | null =>
  x === null || x === undefined || !Number.isFinite(x) ? null : Number(x.toPrecision(digits));
/** `round` of a value already known to be finite. */
const roundFinite = (x: number, digits = 10): number => Number(x.toPrecision(digits));

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
};

/** One well of a dose-response series: concentration µM, % inhibition, and where it was read. */
export type DoseResponsePoint = { concentrationUm: number; inhibitionPct: number; runId: string; well: string };

function ic50Summary(fit: Logistic4Fit, xs: readonly number[]) {
  let lo = Infinity;
  let hi = -Infinity;
  for (const x of xs)
    if (x > 0) {
      if (x < lo) lo = x;
      if (x > hi) hi = x;
    }
  let qualifier: ">" | "<" | null = null;
  let ic50 = fit.ic50;
  if (fit.flags.includes("ic50-above-range")) {
    qualifier = ">";
    ic50 = hi;
  } else if (fit.flags.includes("ic50-below-range")) {
    qualifier = "<";
    ic50 = lo;
  }
  return { ic50, qualifier, rangeUm: [lo, hi] as [number, number] };
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

const pointTuple = (p: DoseResponsePoint): [number, number, string, string] => [
  p.concentrationUm,
  roundFinite(p.inhibitionPct),
  p.runId,
  p.well,
];

/**
 * One compound's dose-response result from its wells (pooled over plates): the pipeline and the
 * `analyze` command both call this, so they report the same outcome, flags and figures.
 */
export function analyseDoseResponseCompound(
  compoundId: string,
  pts: readonly DoseResponsePoint[],
  opts: DoseResponseOptions = {},
): CompoundResult {
  const x = pts.map((p) => p.concentrationUm);
  const y = pts.map((p) => p.inhibitionPct);
  const distinct = new Set(x.filter((c) => c > 0)).size;
  if (distinct < 4 || pts.length < 5) {
    return {
      compoundId,
      nPoints: pts.length,
      flags: ["too-few-points"],
      detail: {
        outcome: "not-determined",
        reason: `too few points: ${pts.length} wells at ${distinct} concentrations above 0; a fit needs at least 5 wells at 4 concentrations`,
        maxInhibitionPct: round(maxAtTop(x, y)),
        testedRangeUm: distinct > 0 ? testedRange(x) : null,
        curve: null,
        adequacy: null,
        weighting: null,
        outliers: null,
        points: pts.map(pointTuple),
      },
    };
  }
  const weighting = decideWeighting(
    opts.weighting ?? DEFAULT_ANALYSIS_WEIGHTING,
    x.map((c) => String(c)),
    y,
  );
  const fit = fitLogistic4(x, y, {
    ...(opts.fixTopPct !== null && opts.fixTopPct !== undefined ? { fixedTop: opts.fixTopPct } : {}),
    ...(opts.fixBottomPct !== null && opts.fixBottomPct !== undefined ? { fixedBottom: opts.fixBottomPct } : {}),
    ...(weighting.used === "relative" ? { weighting: "relative" as const } : {}),
  });
  const flags: string[] = [...fit.flags];
  const s = ic50Summary(fit, x);
  // % inhibition rises with concentration: the upper plateau is the maximum inhibition.
  if (fit.direction === "falling") flags.push("activation-not-inhibition");
  if (
    fit.top !== null &&
    fit.direction === "rising" &&
    fit.top < 80 &&
    !fit.flags.includes("plateau-not-reached") &&
    s.qualifier === null
  )
    flags.push("partial-inhibition");
  if (fit.bottom !== null && Math.abs(fit.bottom) > 20) flags.push("baseline-offset");
  const morrison = tightBindingCheck(fit, x, y, opts.enzymeUm ?? null, flags);
  return {
    compoundId,
    nPoints: pts.length,
    ic50Um: round(s.ic50),
    ic50LoUm: s.qualifier ? null : round(fit.ic50Ci95[0]),
    ic50HiUm: s.qualifier ? null : round(fit.ic50Ci95[1]),
    ic50Qualifier: s.qualifier,
    hill: round(fit.hill),
    flags: [...new Set(flags)],
    detail: {
      outcome: "fitted",
      fit: logistic4Detail(fit),
      testedRangeUm: s.rangeUm,
      fixed: { topPct: opts.fixTopPct ?? null, bottomPct: opts.fixBottomPct ?? null },
      morrison,
      maxInhibitionPct: round(maxAtTop(x, y)),
      weighting: weighting.decision,
      points: pts.map(pointTuple),
    },
  };
}

/** [lowest, highest] concentration above 0. */
function testedRange(x: readonly number[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of x)
    if (c > 0) {
      lo = Math.min(lo, c);
      hi = Math.max(hi, c);
    }
  return [lo, hi];
}

/** Mean % inhibition at the highest concentration (NaN without points). */
function maxAtTop(x: readonly number[], y: readonly number[]): number {
  let top = -Infinity;
  for (const c of x) top = Math.max(top, c);
  let sum = 0;
  let n = 0;
  x.forEach((c, k) => {
    if (c === top) {
      sum += y[k]!;
      n++;
    }
  });
  return n ? sum / n : NaN;
}

/**
 * Tight binding suspected (IC50 < 10·[E] or Hill > 2, common practice): the Morrison equation is
 * fitted with the known enzyme concentration (Morrison 1969; IC50 = K′ + E/2, Copeland et al.
 * 1995) and the flag is added.
 */
function tightBindingCheck(
  fit: Logistic4Fit,
  x: readonly number[],
  y: readonly number[],
  e: number | null,
  flags: string[],
): DoseResponseFittedDetail["morrison"] {
  if (!e || !(e > 0) || fit.ic50 === null) return null;
  const steep = fit.hill !== null && fit.hill > 2;
  if (!(fit.ic50 < 10 * e || steep)) return null;
  flags.push("tight-binding-suspected");
  const v = y.map((p) => 1 - p / 100);
  try {
    const m = fitMorrison([...x], v, e, { fixedV0: 1 });
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

/** The weighting a fit uses: as set, or chosen from the replicate groups (kinetics/weighting). */
function decideWeighting(
  setting: AnalysisWeighting,
  keys: readonly string[],
  y: readonly number[],
): { used: "none" | "relative"; decision: WeightingDecision } {
  if (setting !== "auto")
    return {
      used: setting,
      decision: {
        used: setting,
        chosen: "set",
        reason: setting === "relative" ? "relative weighting 1/Ŷ², as set" : "unweighted, as set",
      },
    };
  const c = chooseWeighting(keys, y);
  return { used: c.weighting, decision: { used: c.weighting, chosen: "auto", reason: c.reason } };
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
    out.push(analyseDoseResponseCompound(id, pts, opts));
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
    dof: m.dof,
    converged: m.converged,
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

export function summariseMechanism(fit: MechanismResult, chosen: InhibitionModel = fit.best) {
  const m = fit.models[chosen];
  const { kiUm: ki, ci95: ci } = headlineKi(chosen, { kicUm: m.kic, kiuUm: m.kiu, ci95: m.ci95 });
  return {
    mechanism: chosen,
    label: fit.label,
    kiUm: round(ki),
    kiCi95Um: [round(ci[0]), round(ci[1])] as [number | null, number | null],
    kicUm: round(m.kic),
    kiuUm: round(m.kiu),
    alpha: round(m.alpha),
    vmax: round(m.vmax),
    kmUm: round(m.km),
  };
}

/**
 * One compound's mechanism result from its wells: the pipeline and the `analyze` command both
 * call this, so they report the same label, models and flags.
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
        reason: `needs at least 3 substrate and 2 inhibitor concentrations (has ${levelsS} and ${levelsI})`,
        points: [...pts],
      },
    };
  }
  const weighting = decideWeighting(
    opts.weighting ?? DEFAULT_ANALYSIS_WEIGHTING,
    pts.map((p) => `${p.substrate}|${p.inhibitor}`),
    pts.map((p) => p.rate),
  );
  let fit: MechanismResult;
  try {
    fit = fitMechanism(pts, { weighting: weighting.used });
  } catch (e) {
    return {
      compoundId,
      nPoints: pts.length,
      flags: ["fit-failed"],
      detail: { error: e instanceof Error ? e.message : String(e), points: [...pts] },
    };
  }
  const s = summariseMechanism(fit);
  const flags: string[] = [];
  if (fit.label === "ambiguous") flags.push("ambiguous-mechanism");
  if (!fit.models[fit.best].converged) flags.push("not-converged");
  if (s.kiCi95Um[0] !== null && s.kiCi95Um[1] !== null && s.kiCi95Um[1] / Math.max(s.kiCi95Um[0], 1e-300) > 10)
    flags.push("ki-ci-wider-than-10-fold");
  if (s.kiCi95Um[1] === null) flags.push("ki-ci-unbounded");
  const maxI = Math.max(...pts.map((p) => p.inhibitor));
  if (s.kiUm !== null && s.kiUm > 3 * maxI) flags.push("ki-above-tested-range");
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
    flags,
    detail: {
      best: fit.best,
      label: fit.label,
      n: fit.n,
      weighting: fit.weighting,
      weightingDecision: weighting.decision,
      models: modelSummaries(fit),
      enzymeUm: round(opts.enzymeUm ?? null),
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
    const result = analyseMechanismCompound(id, pts, opts);
    if (isFittedMechanism(result.detail)) result.detail.backgroundSubtracted = background.size > 0;
    out.push(result);
  }
  return out;
}
