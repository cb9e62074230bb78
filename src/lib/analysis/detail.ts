/**
 * The `detail` JSON of a compound result: everything the sortable columns do not hold (the
 * fit's full parameter set, plot data, the four mechanism models, the Cheng–Prusoff cross-check).
 * `compute.ts` writes it, the `compound_results.detail` column is typed with it, and every reader
 * parses it with `parseResultDetail` instead of digging in an untyped record.
 *
 * The objects are strict, so a misspelt key in a writer or a stored row is an error rather than
 * a silently missing value. Numbers are null where the engine has no finite value (an unbounded
 * CI end, a constant the model does not have). Concentrations are µM.
 */
import { z } from "zod";
import { INHIBITION_MODELS } from "@/lib/kinetics/inhibition-models";
import type { ExperimentKind } from "./kinds";

const num = z.number().nullable();
/** A 95 % CI; an end is null where it is unbounded or cannot be computed. */
const interval = z.tuple([num, num]);

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

const doseResponseFitted = z.strictObject({
  fit: logistic4Summary,
  testedRangeUm: z.tuple([z.number(), z.number()]),
  fixed: z.strictObject({ topPct: num, bottomPct: num }),
  morrison: morrisonSummary.nullable(),
  points: z.array(doseResponsePoint),
});

/** Fewer than 4 concentrations or 5 wells: no fit, only the points. */
const doseResponseTooFew = z.strictObject({ points: z.array(doseResponsePoint) });

export const doseResponseDetailSchema = z.union([doseResponseFitted, doseResponseTooFew]);

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
  /** Extra-sum-of-squares F-test against mixed (null for mixed itself). */
  fTestVsMixedP: num,
  dof: z.number(),
  converged: z.boolean(),
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

const mechanismFitted = z.strictObject({
  best: inhibitionModel,
  label: z.enum(["clear", "ambiguous"]),
  n: z.number(),
  weighting: z.enum(["none", "relative"]),
  /** Every model of INHIBITION_MODELS, no other key. */
  models: z.record(inhibitionModel, modelSummary),
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

/** A dose-response detail with a fit (not the too-few-points record). */
export const isFittedDoseResponse = (d: ResultDetail): d is DoseResponseFittedDetail => "fit" in d;
/** A mechanism detail with the four models (not the too-few-points or failed-fit record). */
export const isFittedMechanism = (d: ResultDetail): d is MechanismFittedDetail => "models" in d;
