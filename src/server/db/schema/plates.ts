import {
  pgTable,
  text,
  timestamp,
  uuid,
  integer,
  index,
  uniqueIndex,
  pgEnum,
  doublePrecision,
  boolean,
  jsonb,
  bigint,
  primaryKey,
  check,
} from "drizzle-orm/pg-core";
import { sql } from "drizzle-orm";
import { users, campaigns } from "./auth";
import { oneOf } from "./checks";
import { PLATE_FORMATS, type PlateFormat } from "@/lib/plates/geometry";
import { WELL_ROLES, type PlateMapWell } from "@/lib/plates/plate-map";
import { QC_VERDICTS, RUN_DECISIONS, SIGNAL_DIRECTIONS, type RunQc } from "@/lib/plates/run-qc";

export const wellRole = pgEnum("well_role", WELL_ROLES);
export const qcVerdict = pgEnum("qc_verdict", QC_VERDICTS);
export const runDecision = pgEnum("run_decision", RUN_DECISIONS);
/** Which way the readout moves when the enzyme is inhibited: a product or activity readout falls. */
export const signalDirection = pgEnum("signal_direction", SIGNAL_DIRECTIONS);

/**
 * A plate map: what is in each well. `wells` holds the non-empty wells as the plate library's
 * PlateMapWell[] (the rest are empty). A map that a run was uploaded against is not edited
 * again (the service refuses), so a run's readings always match the map they were read with;
 * readings also copy each well's role, compound and concentrations at upload time.
 */
export const plateMaps = pgTable(
  "plate_maps",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    format: integer("format").$type<PlateFormat>().notNull(),
    isTemplate: boolean("is_template").notNull().default(false),
    signalDirection: signalDirection("signal_direction").notNull().default("falls"),
    wells: jsonb("wells").$type<PlateMapWell[]>().notNull(),
    sampleWells: integer("sample_wells").notNull(),
    neutralWells: integer("neutral_wells").notNull(),
    fullWells: integer("full_wells").notNull(),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedBy: text("updated_by").references(() => users.id, { onDelete: "set null" }),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("plate_maps_campaign_name").on(t.campaignId, sql`lower(${t.name})`),
    check("plate_maps_format", oneOf(t.format, PLATE_FORMATS)),
  ],
);

/**
 * One uploaded read of one physical plate. The raw file lives in the object store under
 * `s3Key` (keyed by its SHA-256) and was stored and checksummed before it was parsed; the same
 * file (same SHA-256) is refused a second time in a campaign. `qc` holds every QC figure of the
 * latest computation (recomputed on mask/unmask); `zPrime` and `qcVerdict` are copied out of it
 * for lists, the Z′ trend and the analysis (accepted runs only).
 */
export const plateRuns = pgTable(
  "plate_runs",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    plateMapId: uuid("plate_map_id")
      .notNull()
      .references(() => plateMaps.id, { onDelete: "restrict" }),
    barcode: text("barcode"),
    fileName: text("file_name").notNull(),
    contentType: text("content_type").notNull(),
    sizeBytes: bigint("size_bytes", { mode: "number" }).notNull(),
    sha256: text("sha256").notNull(),
    s3Key: text("s3_key").notNull(),
    shape: text("shape").notNull(),
    format: integer("format").$type<PlateFormat>().notNull(),
    reads: integer("reads").notNull(),
    wellCount: integer("well_count").notNull(),
    /** "endpoint" readings are values; "kinetic" readings are initial rates in signal units per second */
    readout: text("readout").notNull(),
    qc: jsonb("qc").$type<RunQc>().notNull(),
    zPrime: doublePrecision("z_prime"),
    qcVerdict: qcVerdict("qc_verdict").notNull(),
    decision: runDecision("decision").notNull().default("pending"),
    decisionReason: text("decision_reason"),
    decidedBy: text("decided_by").references(() => users.id, { onDelete: "set null" }),
    decidedAt: timestamp("decided_at", { withTimezone: true }),
    uploadedBy: text("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    uploadedAt: timestamp("uploaded_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("plate_runs_campaign_sha256").on(t.campaignId, t.sha256),
    index("plate_runs_campaign_uploaded").on(t.campaignId, t.uploadedAt),
    index("plate_runs_campaign_decision").on(t.campaignId, t.decision),
    index("plate_runs_sha256").on(t.sha256),
    index("plate_runs_plate_map").on(t.plateMapId),
    check("plate_runs_format", oneOf(t.format, PLATE_FORMATS)),
  ],
);

export type KineticSeries = { timesS: number[]; values: number[] };

/**
 * One well of one run. `signal` is what QC and % inhibition use: the endpoint value, or for a
 * kinetic run the initial rate (`rateSignalPerS`, with its R², window and linearity flag from
 * the kinetics engine). `masked` mirrors an open row in plate_well_masks (kept in the same
 * transaction) so the analysis can select unmasked wells without a join.
 */
export const wellReadings = pgTable(
  "well_readings",
  {
    runId: uuid("run_id")
      .notNull()
      .references(() => plateRuns.id, { onDelete: "cascade" }),
    well: text("well").notNull(),
    wellIndex: integer("well_index").notNull(),
    role: wellRole("role").notNull(),
    compoundId: text("compound_id"),
    concentrationUm: doublePrecision("concentration_um"),
    substrateUm: doublePrecision("substrate_um"),
    replicateGroup: text("replicate_group"),
    isEdge: boolean("is_edge").notNull(),
    value: doublePrecision("value"),
    rateSignalPerS: doublePrecision("rate_signal_per_s"),
    rateRSquared: doublePrecision("rate_r_squared"),
    rateLinear: boolean("rate_linear"),
    rateProgress: text("rate_progress"),
    rateWindowStartS: doublePrecision("rate_window_start_s"),
    rateWindowEndS: doublePrecision("rate_window_end_s"),
    series: jsonb("series").$type<KineticSeries>(),
    signal: doublePrecision("signal"),
    inhibitionPct: doublePrecision("inhibition_pct"),
    masked: boolean("masked").notNull().default(false),
  },
  (t) => [primaryKey({ columns: [t.runId, t.well] }), index("well_readings_compound").on(t.compoundId, t.runId)],
);

/** Mask history: a mask is closed (unmasked_at set), never deleted; at most one open per well. */
export const plateWellMasks = pgTable(
  "plate_well_masks",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    runId: uuid("run_id")
      .notNull()
      .references(() => plateRuns.id, { onDelete: "cascade" }),
    well: text("well").notNull(),
    reason: text("reason").notNull(),
    maskedBy: text("masked_by").references(() => users.id, { onDelete: "set null" }),
    maskedAt: timestamp("masked_at", { withTimezone: true }).notNull().defaultNow(),
    unmaskedBy: text("unmasked_by").references(() => users.id, { onDelete: "set null" }),
    unmaskedAt: timestamp("unmasked_at", { withTimezone: true }),
    unmaskReason: text("unmask_reason"),
  },
  (t) => [
    uniqueIndex("plate_well_masks_open")
      .on(t.runId, t.well)
      .where(sql`${t.unmaskedAt} is null`),
    index("plate_well_masks_run").on(t.runId),
  ],
);
