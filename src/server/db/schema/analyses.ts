import {
  pgTable,
  text,
  timestamp,
  uuid,
  index,
  uniqueIndex,
  pgEnum,
  doublePrecision,
  boolean,
  jsonb,
  integer,
  check,
} from "drizzle-orm/pg-core";
import { sql } from "drizzle-orm";
import { users, campaigns } from "./auth";
import { plateRuns } from "./plates";
import { oneOf } from "./checks";
import type { ResultDetail } from "@/lib/analysis/detail";
import { EXPERIMENT_KINDS, type ExperimentKind } from "@/lib/analysis/kinds";
import { INHIBITION_MODELS, type InhibitionModel } from "@/lib/kinetics/inhibition-models";
import type { AnalysisWeighting } from "@/lib/analysis/settings";

export const experimentKind = pgEnum("experiment_kind", EXPERIMENT_KINDS);
export const analysisStatus = pgEnum("analysis_status", ["queued", "running", "done", "failed"]);

/** Settings of an experiment; what is not set comes from the campaign (Km, [E], hit threshold). */
export type ExperimentSettings = {
  hitRule?: { kind: "threshold"; thresholdPct: number } | { kind: "sd"; k: number } | { kind: "robust"; k: number };
  /** Weighting of dose-response and mechanism fits; "auto" (the default) decides from replicates. */
  weighting?: AnalysisWeighting;
  /** Report the fit without the outliers a robust fit finds (default off: they are only proposed). */
  robust?: boolean;
  fixTopPct?: number | null;
  fixBottomPct?: number | null;
  /** Substrate concentration of the dose-response assay, µM (for Cheng–Prusoff). */
  substrateUm?: number | null;
  /** Km of the substrate, µM; defaults to the campaign's. */
  kmUm?: number | null;
  /** Enzyme concentration in the assay, nM; defaults to the campaign's. */
  enzymeNm?: number | null;
};

/** An experiment: a set of plate runs analysed together, of one kind. */
export const experiments = pgTable(
  "experiments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    kind: experimentKind("kind").notNull(),
    settings: jsonb("settings").$type<ExperimentSettings>().notNull().default({}),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("experiments_campaign").on(t.campaignId, t.createdAt)],
);

export const experimentRuns = pgTable(
  "experiment_runs",
  {
    experimentId: uuid("experiment_id")
      .notNull()
      .references(() => experiments.id, { onDelete: "cascade" }),
    runId: uuid("run_id")
      .notNull()
      .references(() => plateRuns.id, { onDelete: "restrict" }),
  },
  (t) => [uniqueIndex("experiment_runs_pk").on(t.experimentId, t.runId), index("experiment_runs_run").on(t.runId)],
);

/** What an analysis was computed from: enough to reproduce every number. */
export type AnalysisInputs = {
  engineVersion: string;
  kind: ExperimentKind;
  settings: ExperimentSettings & {
    /**
     * The settings as the computation applied them. `weighting` and `robust` are absent from
     * analyses requested before they existed (those were unweighted unless set, and not robust).
     */
    resolved: {
      hitThresholdPct: number;
      kmUm: number | null;
      enzymeNm: number | null;
      weighting?: AnalysisWeighting;
      robust?: boolean;
    };
  };
  runs: { id: string; sha256: string; fileName: string; decision: string }[];
  masks: { runId: string; well: string; reason: string }[];
};

/**
 * One computation of an experiment. `inputHash` is the SHA-256 of its inputs (engine version,
 * settings, accepted runs' SHA-256s, masks): the same inputs give the same analysis back instead
 * of new rows. Exactly one `current` analysis per experiment — set in the same transaction that
 * writes its results — so a failure part-way leaves the previous results in place; superseded
 * analyses stay as history.
 */
export const analyses = pgTable(
  "analyses",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    experimentId: uuid("experiment_id")
      .notNull()
      .references(() => experiments.id, { onDelete: "cascade" }),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    status: analysisStatus("status").notNull().default("queued"),
    progress: doublePrecision("progress").notNull().default(0),
    engineVersion: text("engine_version").notNull(),
    inputHash: text("input_hash").notNull(),
    inputs: jsonb("inputs").$type<AnalysisInputs>().notNull(),
    isCurrent: boolean("is_current").notNull().default(false),
    compounds: integer("compounds"),
    error: text("error"),
    requestedBy: text("requested_by").references(() => users.id, { onDelete: "set null" }),
    requestedAt: timestamp("requested_at", { withTimezone: true }).notNull().defaultNow(),
    startedAt: timestamp("started_at", { withTimezone: true }),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
    /** Set every ~10 s by the worker running it; a running analysis without one for 60 s is re-queued. */
    heartbeatAt: timestamp("heartbeat_at", { withTimezone: true }),
    /** How many times a worker has taken it; the fence that lets only the latest attempt commit. */
    attempts: integer("attempts").notNull().default(0),
  },
  (t) => [
    index("analyses_experiment").on(t.experimentId, t.requestedAt),
    index("analyses_running_heartbeat")
      .on(t.heartbeatAt)
      .where(sql`${t.status} = 'running'`),
    uniqueIndex("analyses_one_current")
      .on(t.experimentId)
      .where(sql`${t.isCurrent}`),
    index("analyses_campaign_current")
      .on(t.campaignId)
      .where(sql`${t.isCurrent}`),
  ],
);

/**
 * One compound's result in one analysis. Sortable figures are columns (the hit grid sorts and
 * filters in Postgres); the full detail (all four models, plot data, flags) is `detail`.
 * Concentrations in µM.
 */
export const compoundResults = pgTable(
  "compound_results",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    analysisId: uuid("analysis_id")
      .notNull()
      .references(() => analyses.id, { onDelete: "cascade" }),
    experimentId: uuid("experiment_id")
      .notNull()
      .references(() => experiments.id, { onDelete: "cascade" }),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    kind: experimentKind("kind").notNull(),
    compoundId: text("compound_id").notNull(),
    nPoints: integer("n_points").notNull(),
    pctInhibition: doublePrecision("pct_inhibition"),
    pctInhibitionSd: doublePrecision("pct_inhibition_sd"),
    hit: boolean("hit"),
    ic50Um: doublePrecision("ic50_um"),
    ic50LoUm: doublePrecision("ic50_lo_um"),
    ic50HiUm: doublePrecision("ic50_hi_um"),
    ic50Qualifier: text("ic50_qualifier"),
    hill: doublePrecision("hill"),
    mechanism: text("mechanism").$type<InhibitionModel>(),
    mechanismLabel: text("mechanism_label"),
    kiUm: doublePrecision("ki_um"),
    kiLoUm: doublePrecision("ki_lo_um"),
    kiHiUm: doublePrecision("ki_hi_um"),
    kicUm: doublePrecision("kic_um"),
    kiuUm: doublePrecision("kiu_um"),
    alpha: doublePrecision("alpha"),
    flags: text("flags")
      .array()
      .notNull()
      .default(sql`'{}'::text[]`),
    detail: jsonb("detail").$type<ResultDetail>().notNull(),
  },
  (t) => [
    uniqueIndex("compound_results_analysis_compound").on(t.analysisId, t.compoundId),
    index("compound_results_campaign_compound").on(t.campaignId, t.compoundId),
    check("compound_results_mechanism", oneOf(t.mechanism, INHIBITION_MODELS)),
  ],
);

/** A person's override of the chosen mechanism, with a reason (audited); the latest one counts. */
export const mechanismOverrides = pgTable(
  "mechanism_overrides",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    experimentId: uuid("experiment_id")
      .notNull()
      .references(() => experiments.id, { onDelete: "cascade" }),
    compoundId: text("compound_id").notNull(),
    model: text("model").$type<InhibitionModel>().notNull(),
    reason: text("reason").notNull(),
    by: text("by").references(() => users.id, { onDelete: "set null" }),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("mechanism_overrides_experiment").on(t.experimentId, t.compoundId, t.at),
    check("mechanism_overrides_model", oneOf(t.model, INHIBITION_MODELS)),
  ],
);
