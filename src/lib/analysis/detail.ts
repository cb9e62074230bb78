/**
 * The `detail` JSON of a compound result: everything the sortable columns do not hold (the
 * fit's full parameter set, plot data, the four mechanism models, the Cheng–Prusoff cross-check).
 * `compute.ts` writes it, the `compound_results.detail` column is typed with it, and every reader
 * parses it with `parseResultDetail` instead of digging in an untyped record.
 *
 * The objects are strict, so a misspelt key in a writer or a stored row is an error rather than
 * a silently missing value. Numbers are null where the engine has no finite value (an unbounded
 * CI end, a constant the model does not have). Concentrations are µM.
 *
 * Fields added after results were first stored (outcome, adequacy, weighting decision, outlier
 * proposals, alternative models) are optional, so rows written before them still parse.
 */
import { z } from "zod";
import { INHIBITION_MODELS } from "@/lib/kinetics/inhibition-models";
import type { ExperimentKind } from "./kinds";

const num = z.number().nullable();
/** A 95 % CI; an end is null where it is unbounded or cannot be computed. */
const interval = z.tuple([num, num]);

// ---------------------------------------------------------------- shared by the fits

/**
 * Is the model adequate? The lack-of-fit F-test over replicate conditions (null without
 * replicates) and the runs test of the residuals' signs in their natural order (Draper & Smith;
 * Wald–Wolfowitz; see kinetics/adequacy.ts). `adequate` is false when either p < 0.01; `reasons`
 * say which in words.
 */
const adequacySummary = z.strictObject({
  lackOfFit: z.strictObject({ f: num, p: num, dfLof: z.number(), dfPe: z.number() }).nullable(),
  runs: z.strictObject({ runs: z.number(), expected: z.number(), p: num }),
  adequate: z.boolean(),
  reasons: z.array(z.string()),
});

/** The weighting a fit used: set by the experiment, or chosen from the replicates ("auto"), and why. */
const weightingDecision = z.strictObject({
  used: z.enum(["none", "relative"]),
  chosen: z.enum(["auto", "set"]),
  reason: z.string(),
});

export type AdequacySummary = z.infer<typeof adequacySummary>;
export type WeightingDecision = z.infer<typeof weightingDecision>;

// ---------------------------------------------------------------- single-dose

const hitRule = z.discriminatedUnion("kind", [
  z.strictObject({ kind: z.literal("percent"), thresholdPercent: z.number() }),
  z.strictObject({ kind: z.literal("sd"), k: z.number() }),
  z.strictObject({ kind: z.literal("robust"), k: z.number() }),
]);

export const singleDoseDetailSchema = z.strictObject({
  /** The % inhibition cut-off the hit call applied (null when no compound was called). */
  thresholdPct: num,
  /** The rule as applied (a k·SD rule falls back to 50 % when there are too few neutral wells). */
  rule: hitRule,
  concentrationsUm: z.array(z.number()),
});

// ---------------------------------------------------------------- dose-response

/** [concentration µM, % inhibition, run id, well] of each well in the fit. */
const doseResponsePoint = z.tuple([z.number(), z.number(), z.string(), z.string()]);

const logistic4Summary = z.strictObject({
  ic50Um: num,
  log10Ic50: num,
  log10Ic50Se: num,
  ic50Ci95Um: interval,
  hill: num,
  hillSe: num,
  direction: z.enum(["falling", "rising", "flat"]),
  topPct: num,
  bottomPct: num,
  rss: num,
  rSquared: num,
  dof: z.number(),
  converged: z.boolean(),
});

/** The tight-binding fit (Morrison equation), or why it could not be made. */
const morrisonSummary = z.union([
  z.strictObject({
    enzymeUm: z.number(),
    kAppUm: num,
    kAppCi95Um: interval,
    ic50Um: num,
    rss: num,
    converged: z.boolean(),
  }),
  z.strictObject({ error: z.string() }),
]);

/**
 * A well the robust fit finds outlying (ROUT at the stated false-discovery rate): proposed as a
 * mask, never dropped by itself. `residual` is standardised (residual / robust SD); `p` its
 * two-sided p-value.
 */
const doseResponseOutlier = z.strictObject({
  runId: z.string(),
  well: z.string(),
  concentrationUm: z.number(),
  inhibitionPct: z.number(),
  residual: num,
  p: num,
});

/**
 * What the outlier step did: the proposals at false-discovery rate `q`, which points the result
 * reports ("without-outliers" only when robust is on), and the other analysis — without the
 * proposals when they are only proposed, with all points when robust left them out — so the
 * effect of accepting them can be seen. Null when the cheap screen found nothing to search.
 */
const doseResponseOutliers = z.strictObject({
  q: z.number(),
  proposed: z.array(doseResponseOutlier),
  reported: z.enum(["all-points", "without-outliers"]),
  other: z
    .strictObject({
      basis: z.enum(["all-points", "without-outliers"]),
      outcome: z.enum(["fitted", "inactive", "activator", "not-determined"]),
      reason: z.string().nullable(),
      fit: logistic4Summary.nullable(),
    })
    .nullable(),
});

const doseResponseFitted = z.strictObject({
  /** "fitted": an IC50 is reported (absent on rows stored before outcomes existed). */
  outcome: z.literal("fitted").optional(),
  fit: logistic4Summary,
  testedRangeUm: z.tuple([z.number(), z.number()]),
  fixed: z.strictObject({ topPct: num, bottomPct: num }),
  morrison: morrisonSummary.nullable(),
  /** Highest mean % inhibition at the top concentration. */
  maxInhibitionPct: num.optional(),
  adequacy: adequacySummary.nullable().optional(),
  weighting: weightingDecision.optional(),
  outliers: doseResponseOutliers.nullable().optional(),
  points: z.array(doseResponsePoint),
});

/**
 * No IC50: inactive (< 50 % inhibition at the top concentration, with the maximum reached), an
 * activator (the response goes the other way), or not determined (with the reason: too few
 * points, no convergence, a step no curve supports …). `curve` is the 4PL drawn, when there is one.
 */
const doseResponseCalled = z.strictObject({
  outcome: z.enum(["inactive", "activator", "not-determined"]),
  reason: z.string(),
  maxInhibitionPct: num,
  /** Activators: the largest mean rise of activity above the vehicle, %. */
  maxActivationPct: num.optional(),
  /** A step too steep to fix the IC50: the two tested concentrations it lies between, µM. */
  ic50BracketUm: z.tuple([z.number(), z.number()]).optional(),
  testedRangeUm: z.tuple([z.number(), z.number()]).nullable(),
  curve: logistic4Summary.nullable(),
  adequacy: adequacySummary.nullable(),
  weighting: weightingDecision.nullable(),
  outliers: doseResponseOutliers.nullable(),
  points: z.array(doseResponsePoint),
});

/** Fewer than 4 concentrations or 5 wells: no fit, only the points (rows stored before outcomes existed). */
const doseResponseTooFew = z.strictObject({ points: z.array(doseResponsePoint) });

export const doseResponseDetailSchema = z.union([doseResponseFitted, doseResponseCalled, doseResponseTooFew]);

// ---------------------------------------------------------------- mechanism

const modelSummary = z.strictObject({
  vmax: num,
  kmUm: num,
  kicUm: num,
  kiuUm: num,
  alpha: num,
  se: z.strictObject({ vmax: num, km: num, kic: num, kiu: num, a: num, b: num }),
  ci95: z.strictObject({ vmax: interval, km: interval, kic: interval, kiu: interval }),
  rss: num,
  aicc: num,
  deltaAicc: num,
  akaikeWeight: num,
  /** Extra-sum-of-squares F-test against mixed (null for mixed itself): p, and F (absent on older rows). */
  fTestVsMixedP: num,
  fTestVsMixedF: num.optional(),
  dof: z.number(),
  converged: z.boolean(),
  adequacy: adequacySummary.nullable().optional(),
});

export type ModelSummary = z.infer<typeof modelSummary>;

/** [substrate µM, inhibitor µM, background-corrected rate, run id, well]. */
const mechanismPoint = z.tuple([z.number(), z.number(), num, z.string(), z.string()]);

/** The rows handed to the fit when there was none (too few levels, or the fit threw). */
const mechanismRawPoint = z.strictObject({
  substrate: z.number(),
  inhibitor: z.number(),
  rate: z.number(),
  runId: z.string(),
  well: z.string(),
});

/** The IC50 the chosen mechanism predicts at the dose-response assay's [S], against the measured one. */
const chengPrusoffCheck = z.union([
  z.strictObject({
    predictedIc50Um: z.number(),
    measuredIc50Um: z.number(),
    substrateUm: z.number(),
    kmUm: z.number(),
    ratio: z.number(),
    doseResponseExperimentId: z.string(),
  }),
  z.strictObject({ measuredIc50Um: z.number(), note: z.string() }),
]);

export type ChengPrusoffCheck = z.infer<typeof chengPrusoffCheck>;

const inhibitionModel = z.enum(INHIBITION_MODELS);

/** A fitted constant of an alternative model, in its own unit (µM for concentrations, "" for ratios). */
const constantSummary = z.strictObject({
  value: num,
  se: num,
  ci95: interval,
  unit: z.string(),
  /** True where the model fixes the value (β = 1 of partial competitive inhibition): no SE or CI. */
  fixed: z.literal(true).optional(),
});

/**
 * A model outside the four standard ones, fitted because the data call for it: substrate
 * inhibition (Haldane term), partial (hyperbolic) inhibition, or a tight-binding (Morrison)
 * version when the enzyme concentration is known. `meaning` is one plain sentence for the lead.
 */
const alternativeModel = z.strictObject({
  model: z.string(),
  /** The model's name in words, e.g. "partial mixed inhibition". */
  name: z.string(),
  constants: z.record(z.string(), constantSummary),
  rss: num,
  aicc: num,
  /** AICc minus the lowest AICc among all models fitted (standard and alternative). */
  deltaAicc: num,
  dof: z.number(),
  converged: z.boolean(),
  adequacy: adequacySummary.nullable(),
  /** Partial inhibition: the activity left at saturating inhibitor and S = Km, as a fraction. */
  residualActivity: num.optional(),
  /** Tight binding: the total enzyme concentration the Morrison fit used, µM. */
  enzymeUm: num.optional(),
  /**
   * Why this model may not be recommended whatever its AICc (its extra term undetermined, or the
   * F-test not preferring it to its standard mechanism); null when it may (absent on older rows).
   */
  exclusion: z.string().nullable().optional(),
  meaning: z.string(),
});

export type AlternativeModel = z.infer<typeof alternativeModel>;

/** A mechanism well the robust fit finds outlying: proposed as a mask, not dropped. */
const mechanismOutlier = z.strictObject({
  runId: z.string(),
  well: z.string(),
  substrateUm: z.number(),
  inhibitorUm: z.number(),
  rate: z.number(),
  /** Standardised residual and its p-value, where the engine reports them per well (else null). */
  residual: num,
  p: num,
});

/**
 * The outlier step: "screen" when only the cheap screen ran (largest standardised residual of the
 * judged fit below the threshold), "rout" when the robust fit ran; the proposals at
 * false-discovery rate `q`, and the call and Ki without them.
 */
const mechanismOutliers = z.strictObject({
  checked: z.enum(["screen", "rout"]),
  largestStandardized: num,
  /** The model whose residuals were judged (the recommended one, else the standard choice). */
  model: z.string(),
  q: z.number(),
  proposed: z.array(mechanismOutlier),
  reported: z.enum(["all-points", "without-outliers"]),
  callWithout: z.string().nullable(),
  kiWithoutUm: num,
});

/** Why models beyond the four were (or were not) fitted: the screens' p-values and the [E]/Ki check. */
const mechanismScreens = z.strictObject({
  substrateInhibition: z.strictObject({ scoreP: num, ratesFall: z.boolean() }),
  partial: z.strictObject({ scoreP: num }),
  tightBinding: z.strictObject({ enzymeUm: num, kiMinUm: num, kiOverEnzyme: num, near: z.boolean() }).nullable(),
  fitted: z.array(z.strictObject({ family: z.string(), why: z.string() })),
});

const mechanismFitted = z.strictObject({
  best: inhibitionModel,
  /** "inadequate": the chosen standard model fails the adequacy checks (never "clear" then). */
  label: z.enum(["clear", "ambiguous", "inadequate"]),
  /** Why the label is not "clear", in words (absent on rows stored before labels had reasons). */
  labelReasons: z.array(z.string()).optional(),
  n: z.number(),
  /** The weighting the fits used. */
  weighting: z.enum(["none", "relative"]),
  /** How that weighting was decided (set, or chosen from the replicates), and why. */
  weightingDecision: weightingDecision.optional(),
  /** Every model of INHIBITION_MODELS, no other key. */
  models: z.record(inhibitionModel, modelSummary),
  /** Models beyond the four, fitted when the data call for them. */
  alternatives: z.array(alternativeModel).optional(),
  /**
   * The model the engine recommends: one of the four, or an alternative's `model`. Absent when
   * none is adequate (then the flag "no-adequate-model" says so) and on rows stored before it.
   */
  recommended: z.string().optional(),
  /** Why that one, in words. */
  recommendedReason: z.string().optional(),
  /** Enzyme concentration the tight-binding check used, µM (null when not known). */
  enzymeUm: num.optional(),
  outliers: mechanismOutliers.nullable().optional(),
  screens: mechanismScreens.optional(),
  points: z.array(mechanismPoint),
  backgroundSubtracted: z.boolean(),
  /** Present when the campaign has a measured IC50 of the compound (written after the fit). */
  chengPrusoff: chengPrusoffCheck.optional(),
});

export const mechanismDetailSchema = z.union([
  mechanismFitted,
  z.strictObject({ reason: z.string(), points: z.array(mechanismRawPoint) }),
  z.strictObject({ error: z.string(), points: z.array(mechanismRawPoint) }),
]);

// ---------------------------------------------------------------- the union

export type SingleDoseDetail = z.infer<typeof singleDoseDetailSchema>;
export type DoseResponseDetail = z.infer<typeof doseResponseDetailSchema>;
export type DoseResponseFittedDetail = z.infer<typeof doseResponseFitted>;
export type DoseResponseCalledDetail = z.infer<typeof doseResponseCalled>;
export type MechanismDetail = z.infer<typeof mechanismDetailSchema>;
export type MechanismFittedDetail = z.infer<typeof mechanismFitted>;

export const resultDetailSchemas = {
  "single-dose": singleDoseDetailSchema,
  "dose-response": doseResponseDetailSchema,
  mechanism: mechanismDetailSchema,
} as const satisfies Record<ExperimentKind, z.ZodType>;

export type ResultDetail = SingleDoseDetail | DoseResponseDetail | MechanismDetail;

/**
 * The stored detail of a `kind` result, checked. Throws with the first offending path, so a row
 * that does not match says where.
 */
export function parseResultDetail(kind: "single-dose", json: unknown): SingleDoseDetail;
export function parseResultDetail(kind: "dose-response", json: unknown): DoseResponseDetail;
export function parseResultDetail(kind: "mechanism", json: unknown): MechanismDetail;
export function parseResultDetail(kind: ExperimentKind, json: unknown): ResultDetail;
export function parseResultDetail(kind: ExperimentKind, json: unknown): ResultDetail {
  const r = resultDetailSchemas[kind].safeParse(json);
  if (r.success) return r.data;
  const issue = r.error.issues[0];
  const where = issue?.path.length ? issue.path.join(".") : "(top level)";
  throw new Error(`The ${kind} result detail does not match its schema at ${where}: ${issue?.message ?? "invalid"}.`);
}

/** A dose-response detail with a fit and an IC50 (not an inactive/activator/not-determined call or too few points). */
export const isFittedDoseResponse = (d: ResultDetail): d is DoseResponseFittedDetail => "fit" in d;
/** A dose-response detail that reports no IC50 and says why (inactive, activator, not determined). */
export const isCalledDoseResponse = (d: ResultDetail): d is DoseResponseCalledDetail =>
  "outcome" in d && "reason" in d && !("fit" in d);
/** A mechanism detail with the four models (not the too-few-points or failed-fit record). */
export const isFittedMechanism = (d: ResultDetail): d is MechanismFittedDetail => "models" in d;
