/**
 * Judgement on a mechanism study after the four standard fits (mechanism-fit.ts): is the chosen
 * model adequate, do the data call for a model outside the four, which model to recommend, and
 * how sure to be. The rule everywhere: never confidently wrong.
 *
 * 1. The chosen standard model carries its adequacy (lack of fit over replicate (S, I) cells, runs
 *    test along S within each inhibitor series; mechanism-models.ts). Failing either at p < 0.01
 *    labels the call "inadequate", never "clear".
 * 2. Extended families are fitted only when called for (common practice; the screens are cheap):
 *    - substrate inhibition when rates fall at the top of the uninhibited series (the top mean is
 *      more than 2 SE below the peak) or the score screen for a Haldane term is positive
 *      (p < SCREEN_ALPHA, 0.001);
 *    - partial inhibition when the score screen for ESI turnover is positive (p < 0.001);
 *    - tight binding when the enzyme concentration is given and the chosen model's smallest
 *      inhibition constant is below 10·[E] (Copeland 2005 [from memory]; science.md: IC50 < ~10·E);
 *    - all of them (tight binding only with [E]) when the chosen model is inadequate.
 * 3. Recommendation: among adequate, converged candidates (the four and the fitted extended
 *    models), the lowest AICc; then, as long as a simpler nested candidate is not rejected by the
 *    extra-sum-of-squares F-test at p < 0.05, the simpler one (Burnham & Anderson 2002; Motulsky &
 *    Christopoulos 2004 [from memory]). When the tight-binding screen fires the depletion-aware
 *    models replace the four: with [E] known and within 10-fold of Ki, free inhibitor ≠ total
 *    inhibitor is physics, not a hypothesis to test. No adequate candidate: no recommendation.
 * 4. Label of the standard call `best`: "inadequate" when it fails adequacy, when a model outside
 *    the four is recommended (the four's constants would mislead) or when nothing is adequate;
 *    otherwise the four-model label, with "clear" lowered to "ambiguous" when a caller's check
 *    (weighting, outliers) shows the call is fragile. The recommendation has its own label:
 *    "ambiguous" when another adequate candidate is within ΔAICc 2, when a simpler nested candidate
 *    is rejected only at p ≥ CLEAR_F_ALPHA, when a substrate-inhibition or partial model is
 *    preferred although the standard choice passed its adequacy checks, or when the call is fragile.
 */
import { aicc, extraSumOfSquaresFTest, type FTestResult } from "./model-selection";
import { INHIBITION_MODELS, MODEL_PARAMETER_COUNT, type InhibitionModel } from "./inhibition-models";
import {
  EXTENDED_MODELS,
  extendedParameterCount,
  extraTermScreens,
  familyModels,
  fitExtendedModel,
  mechanismAdequacy,
  modelFamily,
  modelMechanism,
  summariseExtended,
  type AdequacyContext,
  type Estimate,
  type ExtendedFamily,
  type ExtendedModel,
  type ExtendedModelFit,
  type MechanismAdequacy,
  type MechanismData,
  type RawExtendedFit,
  type ScoreTest,
} from "./mechanism-models";

export const MECHANISM_LABELS = ["clear", "ambiguous", "inadequate"] as const;
export type MechanismLabel = (typeof MECHANISM_LABELS)[number];

export type CandidateModel = InhibitionModel | ExtendedModel;

export const MECHANISM_FLAG_CODES = [
  "inadequate-fit",
  "no-adequate-model",
  "substrate-inhibition",
  "partial-inhibition",
  "tight-binding",
  "noise-grows-with-rate",
  "weighting-sensitive",
  "outliers-proposed",
] as const;
export type MechanismFlagCode = (typeof MECHANISM_FLAG_CODES)[number];

export interface MechanismFlag {
  code: MechanismFlagCode;
  message: string;
}

/**
 * p below which a score screen calls for an extended fit. Each screen run at 0.01 sent about 1 % of
 * clean matrices to the extended fits and a model outside the four won there almost every time
 * (the screen and the F-test measure the same thing); at 0.001 every difficult invented case in
 * mechanism-judgement.test.ts is still caught (their p are 1e-5 and below) and clean matrices
 * labelled inadequate fall from about 2 % to 1 %.
 */
export const SCREEN_ALPHA = 0.001;
/** Tight binding is considered when the smallest Ki is below this multiple of [E] (common practice). */
export const TIGHT_BINDING_RATIO = 10;
/** Nested-model preference: the simpler model stays unless the F-test rejects it at this level. */
export const NESTED_F_ALPHA = 0.05;
/**
 * A call that needs a more complex model to beat a simpler nested one is "clear" only when the
 * F-test rejects the simpler model at this level (else "ambiguous"). Measured on 2000 invented
 * matrices from the simpler models (testdata/synthetic.ts): at 0.01, 6 were called "mixed, clear";
 * at 0.001, none were; true mixed matrices stay clear in 90 % (95 % at 0.01).
 */
export const CLEAR_F_ALPHA = 0.001;

/** What the judgement needs from the standard fit of one model. */
export interface StandardModelView {
  nParams: number;
  vmax: number;
  km: number;
  a: number;
  b: number;
  kic: number | null;
  kiu: number | null;
  se: { kic: number | null; kiu: number | null };
  ci95: { kic: [number | null, number | null]; kiu: [number | null, number | null] };
  rss: number;
  aicc: number;
  converged: boolean;
  adequacy: MechanismAdequacy;
  /** The standard fit's F-test against mixed (same floored RSS and df as here), reused. */
  fTestVsMixed: FTestResult | null;
}

export interface JudgementInput {
  d: MechanismData;
  ctx: AdequacyContext;
  /** RSS at or below this is rounding noise (exact data). */
  rssFloor: number;
  best: InhibitionModel;
  label: "clear" | "ambiguous";
  models: Record<InhibitionModel, StandardModelView>;
  /** Typical inhibitor concentration (median of the positive ones) and the top substrate. */
  iRef: number;
  sMax: number;
  enzymeConc: number | null;
  /** "auto" (default): fit extended families when called for; "all": always; "none": never. */
  extendedModels: "auto" | "all" | "none";
  /** Findings of the caller's checks that make the standard call fragile (weighting, outliers). */
  fragile: string[];
  /** Unit labels for the sentences (the engine is unit-agnostic: none by default). */
  units?: JudgementUnits;
  /**
   * The replicates show scatter growing with the rate while the fit is unweighted: the screens and
   * F-tests then overweight the largest rates, so nothing outside the four is recommended as clear.
   */
  unequalScatter?: boolean;
}

export interface MechanismScreens {
  substrateInhibition: { scoreP: number; ratesFall: boolean };
  partial: { scoreP: number };
  /** Score screen for inhibitor depletion (tight binding), run with or without [E]. */
  depletion: { scoreP: number };
  tightBinding: { enzymeConc: number; kiMin: number | null; kiOverEnzyme: number | null; near: boolean } | null;
  /** The families fitted and why. */
  fitted: { family: ExtendedFamily; why: string }[];
}

export interface MechanismRecommendation {
  model: CandidateModel;
  family: "standard" | ExtendedFamily;
  /** The inhibition terms of the recommended model. */
  mechanism: InhibitionModel;
  label: "clear" | "ambiguous";
  kic: Estimate;
  kiu: Estimate;
  reason: string;
}

export interface MechanismJudgement {
  label: MechanismLabel;
  flags: MechanismFlag[];
  recommended: MechanismRecommendation | null;
  alternatives: ExtendedModelFit[];
  screens: MechanismScreens;
}

/** Direct nesting: each model's simpler models obtained by fixing one constraint. */
const NESTED_IN: Partial<Record<CandidateModel, CandidateModel[]>> = {
  mixed: ["competitive", "uncompetitive", "noncompetitive"],
  "substrate-inhibition-competitive": ["competitive"],
  "substrate-inhibition-uncompetitive": ["uncompetitive"],
  "substrate-inhibition-noncompetitive": ["noncompetitive"],
  "substrate-inhibition-mixed": [
    "mixed",
    "substrate-inhibition-competitive",
    "substrate-inhibition-uncompetitive",
    "substrate-inhibition-noncompetitive",
  ],
  "partial-competitive": ["competitive"],
  "partial-uncompetitive": ["uncompetitive"],
  "partial-noncompetitive": ["noncompetitive"],
  "partial-mixed": ["mixed", "partial-competitive", "partial-uncompetitive", "partial-noncompetitive"],
  "tight-binding-mixed": ["tight-binding-competitive", "tight-binding-uncompetitive", "tight-binding-noncompetitive"],
};

/** All models nested in each model (transitive closure of NESTED_IN), computed once. */
const NESTED_CLOSURE = new Map<CandidateModel, ReadonlySet<CandidateModel>>();
for (const m of [...INHIBITION_MODELS, ...EXTENDED_MODELS]) {
  const out = new Set<CandidateModel>();
  const stack = [...(NESTED_IN[m] ?? [])];
  while (stack.length) {
    const x = stack.pop()!;
    if (out.has(x)) continue;
    out.add(x);
    stack.push(...(NESTED_IN[x] ?? []));
  }
  NESTED_CLOSURE.set(m, out);
}

function nestedClosure(m: CandidateModel): ReadonlySet<CandidateModel> {
  return NESTED_CLOSURE.get(m)!;
}

/** Unit labels the sentences attach to concentrations and rates ("µM"; none when absent). */
export interface JudgementUnits {
  concentration?: string;
  rate?: string;
}

/** A concentration for a sentence, with its unit when one is given: "0.12 µM". */
export function concText(x: number | null | undefined, units: JudgementUnits = {}, digits = 2): string {
  const t = num(x, digits);
  return units.concentration && t !== "—" ? `${t} ${units.concentration}` : t;
}

/** Plain number for a sentence: 2–3 significant figures. */
function num(x: number | null | undefined, digits = 2): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "—";
  return String(Number(x.toPrecision(digits)));
}

/** Which constant kiMin picks: "Kic" or "Kiu". */
function kiMinName(kic: number | null, kiu: number | null): string {
  const m = kiMin(kic, kiu);
  return m !== null && m === kic ? "Kic" : "Kiu";
}

/** Smallest finite inhibition constant of a fit, or null. */
function kiMin(kic: number | null, kiu: number | null): number | null {
  const v = [kic, kiu].filter((k): k is number => k !== null && Number.isFinite(k) && k > 0);
  return v.length ? Math.min(...v) : null;
}

/**
 * Do the rates fall at the top of the uninhibited series? True when the mean at the highest S is
 * more than 2 standard errors below the highest mean at a lower S (SE from the pooled replicate
 * scatter of that series, or the chosen fit's residual SD without replicates) [common practice].
 * Walks the context's series order, whose first block is the lowest inhibitor level by S.
 */
function ratesFallAtHighSubstrate(d: MechanismData, ctx: AdequacyContext, fallbackSd: number): boolean {
  const order = ctx.order;
  if (d.n === 0) return false;
  const iMin = d.i[order[0]!]!;
  let levels = 0;
  let ss = 0;
  let df = 0;
  let peakMean = -Infinity;
  let peakN = 0;
  let lastMean = 0;
  let lastN = 0;
  let j = 0;
  while (j < d.n && d.i[order[j]!] === iMin && !(d.s[order[j]!]! > 0)) j++;
  while (j < d.n && d.i[order[j]!] === iMin) {
    const s = d.s[order[j]!]!;
    let end = j;
    let sum = 0;
    while (end < d.n && d.i[order[end]!] === iMin && d.s[order[end]!] === s) sum += d.y[order[end++]!]!;
    const m = end - j;
    const mean = sum / m;
    for (let k = j; k < end; k++) ss += (d.y[order[k]!]! - mean) ** 2;
    df += m - 1;
    if (levels > 0 && lastMean > peakMean) {
      peakMean = lastMean;
      peakN = lastN;
    }
    lastMean = mean;
    lastN = m;
    levels++;
    j = end;
  }
  if (levels < 3) return false;
  const sd = df >= 2 ? Math.sqrt(ss / df) : fallbackSd;
  return peakMean - lastMean > 2 * sd * Math.sqrt(1 / lastN + 1 / peakN);
}

interface Candidate {
  model: CandidateModel;
  nParams: number;
  rss: number;
  aicc: number;
  eligible: boolean;
}

/** Judges a four-model fit (see the file comment). Pure; deterministic. */
export function judgeMechanism(input: JudgementInput): MechanismJudgement {
  const { d, best, models } = input;
  const chosen = models[best];
  const flags: MechanismFlag[] = [];
  const conc = (x: number | null | undefined) => concText(x, input.units);
  const n = d.n;
  const effRss = (rss: number) => Math.max(rss, input.rssFloor);

  // --- screens (cheap) ---
  const score = extraTermScreens(best, d, chosen, input.rssFloor);
  const fallbackSd = Math.sqrt(chosen.rss / Math.max(1, n - chosen.nParams));
  // Rates on the fit's scale are only comparable for unweighted fits; weighted fits rely on the score screen.
  const ratesFall = !input.ctx.weighted && ratesFallAtHighSubstrate(d, input.ctx, fallbackSd);
  const e = input.enzymeConc;
  const chosenKiMin = kiMin(chosen.kic, chosen.kiu);
  const tb =
    e !== null
      ? {
          enzymeConc: e,
          kiMin: chosenKiMin,
          kiOverEnzyme: chosenKiMin !== null ? chosenKiMin / e : null,
          near: chosenKiMin !== null && chosenKiMin < TIGHT_BINDING_RATIO * e,
        }
      : null;
  const screens: MechanismScreens = {
    substrateInhibition: { scoreP: score.substrateInhibition.p, ratesFall },
    partial: { scoreP: score.partial.p },
    depletion: { scoreP: score.depletion.p },
    tightBinding: tb,
    fitted: [],
  };
  const inadequate = !chosen.adequacy.adequate;
  const all = input.extendedModels === "all";
  if (input.extendedModels !== "none") {
    const why = (reasons: string[]) => reasons.filter(Boolean).join("; ");
    const siWhy = why([
      all ? "requested" : "",
      inadequate ? `the ${best} model is inadequate` : "",
      ratesFall ? "rates fall at the top of the uninhibited series" : "",
      score.substrateInhibition.p < SCREEN_ALPHA
        ? screenText("a substrate-inhibition term", score.substrateInhibition)
        : "",
    ]);
    if (siWhy) screens.fitted.push({ family: "substrate-inhibition", why: siWhy });
    const pWhy = why([
      all ? "requested" : "",
      inadequate ? `the ${best} model is inadequate` : "",
      score.partial.p < SCREEN_ALPHA ? screenText("turnover of the ESI complex", score.partial) : "",
    ]);
    if (pWhy) screens.fitted.push({ family: "partial", why: pWhy });
    if (e !== null) {
      const tWhy = why([
        all ? "requested" : "",
        inadequate ? `the ${best} model is inadequate` : "",
        tb!.near
          ? `the smallest Ki of the ${best} fit (${kiMinName(chosen.kic, chosen.kiu)} ${conc(chosenKiMin)}) is within ${TIGHT_BINDING_RATIO}-fold of [E] ${conc(e)}`
          : "",
        score.depletion.p < SCREEN_ALPHA ? screenText("inhibitor depletion", score.depletion) : "",
      ]);
      if (tWhy) screens.fitted.push({ family: "tight-binding", why: tWhy });
    }
  }

  // --- extended fits ---
  const alternatives: ExtendedModelFit[] = [];
  for (const { family } of screens.fitted) {
    // The three constrained members first; the mixed member starts from their solutions.
    const fitted: RawExtendedFit[] = [];
    for (const model of familyModels(family)) {
      const base = models[modelMechanism(model)];
      const raw = fitExtendedModel(model, d, base, {
        enzymeConc: e ?? undefined,
        sMax: input.sMax,
        iRef: input.iRef,
        ...(modelMechanism(model) === "mixed" ? { nested: fitted } : {}),
      });
      fitted.push(raw);
      const p = extendedParameterCount(model);
      const adequacy = mechanismAdequacy(input.ctx, d, raw.residuals, p, input.rssFloor);
      alternatives.push(summariseExtended(raw, n, e, aicc(effRss(raw.rss), n, p), adequacy));
    }
  }

  // --- candidates and recommendation ---
  const tbNear = tb?.near === true && alternatives.some((a) => a.family === "tight-binding" && a.adequacy.adequate);
  const candidates: Candidate[] = [
    ...INHIBITION_MODELS.map((m) => ({
      model: m as CandidateModel,
      nParams: MODEL_PARAMETER_COUNT[m],
      rss: effRss(models[m].rss),
      aicc: models[m].aicc,
      eligible: !tbNear && models[m].converged && models[m].adequacy.adequate && Number.isFinite(models[m].aicc),
    })),
    ...alternatives.map((a) => ({
      model: a.model as CandidateModel,
      nParams: a.nParams,
      rss: effRss(a.rss),
      aicc: a.aicc,
      eligible:
        (!tbNear || a.family === "tight-binding") && a.converged && a.adequacy.adequate && Number.isFinite(a.aicc),
    })),
  ];
  let minAicc = Infinity;
  for (const c of candidates) if (c.aicc < minAicc) minAicc = c.aicc;
  for (const a of alternatives) a.deltaAicc = a.aicc - minAicc;

  const byModel = new Map(candidates.map((c) => [c.model, c]));
  // F-tests asked for more than once (and the four models' against mixed, already computed) are kept.
  const fCache = new Map<string, FTestResult>();
  const fTest = (simple: Candidate, complex: Candidate): FTestResult => {
    if (complex.model === "mixed" && simple.model !== "mixed") {
      const known = models[simple.model as InhibitionModel]?.fTestVsMixed;
      if (known) return known;
    }
    const key = `${simple.model}<${complex.model}`;
    let r = fCache.get(key);
    if (!r) {
      r = extraSumOfSquaresFTest(simple.rss, n - simple.nParams, complex.rss, n - complex.nParams);
      fCache.set(key, r);
    }
    return r;
  };
  // A model beyond the four earns its extra term only when that term is determined and the F-test
  // prefers it to its own standard mechanism; otherwise it may not be recommended, and says why.
  // A depletion-aware model has no extra term: it earns its place only when depletion can matter
  // (Ki within 10-fold of [E], or the depletion screen positive). Far from that it is the standard
  // model in all but name, and winning by rounding would put a false "tight binding" on the call.
  const depletionMatters = tb?.near === true || score.depletion.p < SCREEN_ALPHA;
  for (const a of alternatives) {
    const self = byModel.get(a.model)!;
    a.exclusion =
      undeterminedTerm(a, input.units) ??
      (a.family === "tight-binding"
        ? depletionMatters
          ? null
          : `[E] ${conc(e)} is more than ${TIGHT_BINDING_RATIO}-fold below ${kiMinName(chosen.kic, chosen.kiu)} ${conc(chosenKiMin)} and the depletion screen is negative (p ${num(score.depletion.p)}): depletion cannot change the call`
        : unsupportedByFTest(a, fTest(byModel.get(a.mechanism)!, self).p));
    if (a.exclusion !== null) self.eligible = false;
  }
  const eligible = candidates.filter((c) => c.eligible);
  let current: Candidate | null = null;
  for (const c of eligible) if (current === null || c.aicc < current.aicc) current = c;
  let simplified = false;
  for (let step = 0; current !== null && step < 8; step++) {
    const cur: Candidate = current;
    const nested = nestedClosure(cur.model);
    let next: Candidate | null = null;
    for (const c of eligible) {
      if (!nested.has(c.model) || c.nParams >= cur.nParams) continue;
      if (fTest(c, cur).p < NESTED_F_ALPHA) continue;
      if (next === null || c.aicc < next.aicc) next = c;
    }
    if (next === null) break;
    simplified = true;
    current = next;
  }

  let recommended: MechanismRecommendation | null = null;
  if (current !== null) {
    const rec: Candidate = current;
    // As the four-model label: any other adequate candidate within ΔAICc 2 makes it ambiguous; and
    // so does a fitted simpler nested model that the F-test rejects only weakly (CLEAR_F_ALPHA).
    const rival = eligible.find((c) => c.model !== rec.model && c.aicc - rec.aicc < 2);
    const nestedRec = nestedClosure(rec.model);
    const weakly = candidates.find(
      (c) => nestedRec.has(c.model) && c.nParams < rec.nParams && !(fTest(c, rec).p < CLEAR_F_ALPHA),
    );
    const alt = alternatives.find((a) => a.model === rec.model);
    const family = alt ? alt.family : "standard";
    const mechanism = alt ? alt.mechanism : (rec.model as InhibitionModel);
    const std = alt ? null : models[rec.model as InhibitionModel];
    // A model outside the four is clearly needed only when the standard choice fails its own
    // adequacy checks (or, for tight binding, when [E] puts Ki in range: physics, not a test).
    const doubtful =
      alt !== undefined && ((alt.family !== "tight-binding" && !inadequate) || input.unequalScatter === true);
    recommended = {
      model: rec.model,
      family,
      mechanism,
      label: rival || weakly || doubtful || input.fragile.length ? "ambiguous" : "clear",
      kic: alt ? alt.kic : { value: std!.kic, se: std!.se.kic, ci95: std!.ci95.kic },
      kiu: alt ? alt.kiu : { value: std!.kiu, se: std!.se.kiu, ci95: std!.ci95.kiu },
      reason: recommendationReason(rec, rival ?? null, weakly ?? null, tbNear, simplified),
    };
  }

  // --- sentences ---
  for (const a of alternatives) a.sentence = sentence(a, input, recommended, byModel, fTest);

  // --- label and flags ---
  let label: MechanismLabel = input.label;
  if (inadequate) {
    label = "inadequate";
    flags.push({
      code: "inadequate-fit",
      message: `The ${best} model does not describe the data: ${chosen.adequacy.reasons.join("; ")}.`,
    });
  }
  if (recommended === null) {
    label = "inadequate";
    const excluded = alternatives.filter((a) => a.adequacy.adequate && a.converged && a.exclusion !== null);
    const why = excluded.length
      ? `No model tried both describes these data adequately and is determined by them (${excluded.map((a) => `${modelName(a.model)}: ${a.exclusion}`).join("; ")})`
      : "No model tried describes these data adequately";
    flags.push({
      code: "no-adequate-model",
      message: `${why}: check for outlying wells, tight binding (give the enzyme concentration), time-dependent or non-specific inhibition before reporting a Ki.`,
    });
  } else if (recommended.family !== "standard") {
    label = "inadequate";
    const alt = alternatives.find((a) => a.model === recommended!.model)!;
    const code =
      alt.family === "substrate-inhibition"
        ? "substrate-inhibition"
        : alt.family === "partial"
          ? "partial-inhibition"
          : "tight-binding";
    flags.push({ code, message: alt.sentence });
  } else if (recommended.model !== best) {
    label = "inadequate";
  }
  if (tb?.near && recommended?.family !== "tight-binding") {
    if (label === "clear") label = "ambiguous";
    flags.push({
      code: "tight-binding",
      message: `Tight binding: ${kiMinName(chosen.kic, chosen.kiu)} of the ${best} fit (${conc(chosenKiMin)}) is within ${TIGHT_BINDING_RATIO}-fold of the enzyme concentration (${conc(e)}), so free inhibitor is depleted; the standard models' Ki may be an overestimate (potency underestimated) and the mechanism unreliable.`,
    });
  }
  if (e === null && score.depletion.p < SCREEN_ALPHA) {
    label = "inadequate";
    if (recommended) recommended.label = "ambiguous";
    flags.push({
      code: "tight-binding",
      message: `Tight binding suspected: inhibition is weaker at low inhibitor and steeper than simple binding allows, as when the inhibitor is depleted by binding the enzyme (score screen p ${num(score.depletion.p)}). Give the enzyme concentration to fit the depletion-aware model; until then the Ki may be an overestimate and the mechanism unreliable.`,
    });
  }
  if (input.fragile.length && label === "clear") label = "ambiguous";
  return { label, flags, recommended, alternatives, screens };
}

/**
 * The term a model beyond the four adds to its standard mechanism, and the value at which it
 * reduces to that mechanism: Ksi → ∞ (substrate inhibition), β = 0 (partial uncompetitive,
 * noncompetitive, mixed: the ESI complex does not turn over) and, for partial competitive
 * (β fixed at 1), Kiu → ∞ (no ESI complex). The term is determined when its 95 % CI is finite
 * and excludes that value (common practice: a term whose CI includes the nested value is not
 * supported by the data). Returns why not, in words, or null when determined.
 */
export function undeterminedTerm(a: ExtendedModelFit, units: JudgementUnits = {}): string | null {
  const reducesTo = `where ${modelName(a.model)} reduces to ${a.mechanism} inhibition`;
  const conc = (x: number | null) => concText(x, units);
  const ci = (e: Estimate, f: (x: number | null) => string) =>
    `${f(e.ci95[0])}–${e.ci95[1] === null ? "unbounded" : f(e.ci95[1])}`;
  if (a.family === "substrate-inhibition" || (a.family === "partial" && a.mechanism === "competitive")) {
    const name = a.family === "substrate-inhibition" ? "Ksi" : "Kiu";
    const e = a.family === "substrate-inhibition" ? a.ksi : a.kiu;
    if (e && e.value !== null && e.ci95[0] !== null && e.ci95[1] !== null && Number.isFinite(e.ci95[1])) return null;
    return `${name} is not determined (95 % CI of ${name} ${e ? ci(e, conc) : "—"}: it may be infinite, ${reducesTo})`;
  }
  if (a.family === "partial") {
    const e = a.beta;
    if (e && e.value !== null && e.ci95[0] !== null && e.ci95[1] !== null && e.ci95[0] > 0) return null;
    const why = e && e.ci95[0] !== null && e.ci95[1] !== null ? "includes 0" : "is unbounded";
    return `β is not determined (95 % CI of β ${e ? ci(e, (x) => num(x)) : "—"}, dimensionless, ${why}, ${reducesTo})`;
  }
  return null;
}

function unsupportedByFTest(a: ExtendedModelFit, p: number): string | null {
  if (p < NESTED_F_ALPHA) return null;
  return `the F-test does not prefer it to ${a.mechanism} inhibition (p ${num(p)}, needs < ${NESTED_F_ALPHA})`;
}

/** "partial mixed inhibition", "competitive inhibition with substrate inhibition", … */
export function modelName(model: CandidateModel): string {
  if ((INHIBITION_MODELS as readonly string[]).includes(model)) return `${model} inhibition`;
  const m = model as ExtendedModel;
  const mech = modelMechanism(m);
  const fam = modelFamily(m);
  if (fam === "substrate-inhibition") return `${mech} inhibition with substrate inhibition`;
  return `${fam} ${mech} inhibition`;
}

function screenText(term: string, t: ScoreTest): string {
  return `the score screen for ${term} is positive (t ${num(t.t, 3)}, p ${num(t.p)})`;
}

function recommendationReason(
  rec: Candidate,
  rival: Candidate | null,
  weakly: Candidate | null,
  tbNear: boolean,
  simplified: boolean,
): string {
  const parts = [`lowest AICc among the adequate models`];
  if (simplified) parts.push("simpler nested models kept unless the F-test rejects them at p < 0.05");
  if (tbNear) parts.push("depletion-aware models only, since Ki is within 10-fold of [E]");
  if (rival) parts.push(`${rival.model} is within ΔAICc ${num(rival.aicc - rec.aicc)}`);
  if (weakly) parts.push(`the simpler ${weakly.model} is rejected only at p ≥ ${CLEAR_F_ALPHA}`);
  return `${rec.model}: ${parts.join("; ")}.`;
}

/** The Ki a lead would quote from a fit: Kic, or Kiu where there is no Kic (uncompetitive). */
function quotedKi(kic: number | null, kiu: number | null): number | null {
  return kic ?? kiu;
}

function sentence(
  a: ExtendedModelFit,
  input: JudgementInput,
  recommended: MechanismRecommendation | null,
  byModel: Map<CandidateModel, Candidate>,
  fTest: (s: Candidate, c: Candidate) => { p: number },
): string {
  const chosen = input.models[input.best];
  const conc = (x: number | null | undefined) => concText(x, input.units);
  const kiText = (kic: number | null, kiu: number | null) =>
    `${kic !== null ? "Kic" : "Kiu"} ${concText(quotedKi(kic, kiu), input.units, 3)}`;
  const self = byModel.get(a.model)!;
  const fp = a.family === "tight-binding" ? null : fTest(byModel.get(a.mechanism)!, self).p;
  if (recommended?.model === a.model) {
    if (a.family === "partial")
      return `Inhibition levels off at ${levelsOff(a)} (at S = Km): a partial inhibitor whose enzyme–substrate–inhibitor complex still turns over (β ${num(a.beta?.value)}, its turnover relative to the enzyme–substrate complex); ${kiText(a.kic.value, a.kiu.value)} from this model; Ki from the four standard models would be misleading (the ${input.best} fit gives ${kiText(chosen.kic, chosen.kiu)}).`;
    if (a.family === "substrate-inhibition")
      return `Rates fall at high substrate (Ksi about ${conc(a.ksi?.value)}): the enzyme is substrate-inhibited; allowing for it the inhibitor is ${a.mechanism} with ${kiText(a.kic.value, a.kiu.value)}, where the four standard models call it ${input.best}.`;
    const why =
      input.enzymeConc !== null && kiMin(chosen.kic, chosen.kiu)! < TIGHT_BINDING_RATIO * input.enzymeConc
        ? `Ki is within ${TIGHT_BINDING_RATIO}-fold of the enzyme concentration (${conc(input.enzymeConc)})`
        : `Inhibition is weaker at low inhibitor and steeper than simple binding allows at this enzyme concentration (${conc(input.enzymeConc)})`;
    return `${why}: a tight binder that depletes the free inhibitor; allowing for that the inhibitor is ${a.mechanism} with ${kiText(a.kic.value, a.kiu.value)}, where the four standard models call it ${input.best} with ${kiText(chosen.kic, chosen.kiu)}.`;
  }
  const what =
    a.family === "partial"
      ? `Partial inhibition (${a.model}, levelling off at ${levelsOff(a)})`
      : a.family === "substrate-inhibition"
        ? `Substrate inhibition (${a.model}, ${a.ksi?.value ? `Ksi ${conc(a.ksi.value)}` : "no finite Ksi"})`
        : `The depletion-aware ${a.mechanism} fit (${kiText(a.kic.value, a.kiu.value)} at [E] ${conc(input.enzymeConc)})`;
  if (a.family === "tight-binding" && a.exclusion !== null) return `${what} is not recommended: ${a.exclusion}.`;
  if (!a.adequacy.adequate) return `${what} is itself inadequate (${a.adequacy.reasons.join("; ")}).`;
  if (a.exclusion !== null && !a.exclusion.startsWith("the F-test"))
    return `${what} is not recommended: ${a.exclusion}.`;
  if (fp !== null && !(fp < NESTED_F_ALPHA)) {
    const meaning =
      a.family === "partial" ? ": inhibition appears to go to completion" : ": no substrate inhibition is evident";
    return `${what} does not fit better than ${a.mechanism} enough to prefer it (F-test p ${num(fp)})${meaning}.`;
  }
  const better = fp !== null ? ` fits better than ${a.mechanism} (F-test p ${num(fp)}), but` : "";
  const other = recommended ? `${recommended.model} is preferred` : "no model is adequate";
  return `${what}${better} is not the recommendation: ${other} (ΔAICc of this model ${num(a.deltaAicc)}).`;
}

/** "about 60 %": the most inhibition a partial model allows at S = Km. */
function levelsOff(a: ExtendedModelFit): string {
  const left = a.residualActivity;
  return left !== null ? `about ${num(100 * (1 - Math.min(1, Math.max(0, left))))} %` : "below 100 %";
}

/** Every extended model name, for consumers that enumerate them. */
export const CANDIDATE_MODELS: readonly CandidateModel[] = [...INHIBITION_MODELS, ...EXTENDED_MODELS];
