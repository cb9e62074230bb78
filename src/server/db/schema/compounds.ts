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
  jsonb,
  bigint,
  bit,
  date,
  primaryKey,
  boolean,
  pgSequence,
  check,
} from "drizzle-orm/pg-core";
import { sql } from "drizzle-orm";
import { users } from "./auth";
import { oneOf } from "./checks";
import { IMPORT_FORMATS, type ImportFormat } from "@/lib/chem/import-types";

/**
 * The number behind a registry ID (`INH-000123` = env.REGISTRY_PREFIX + this number, zero-padded
 * to 6 digits). A sequence, not max()+1, so concurrent registrations never collide; numbers lost
 * to a rolled-back transaction are not reused (common practice for registries: an ID is never
 * given twice).
 */
export const compoundNumberSeq = pgSequence("compound_number_seq", { startWith: 1, increment: 1 });

/**
 * A registered compound: the normalised parent structure (salts belong to batches) and its
 * computed properties (openchemlib, see src/lib/chem/properties.ts). `structureKey` is unique: the
 * same structure registered again is a duplicate (a batch is added instead). `flatKey` (no stereo)
 * is not unique: another stereo form may be registered with a `distinctReason`.
 */
export const compounds = pgTable(
  "compounds",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    registryId: text("registry_id").notNull(),
    registryNumber: integer("registry_number").notNull(),
    name: text("name"),
    aliases: text("aliases")
      .array()
      .notNull()
      .default(sql`'{}'::text[]`),
    structureKey: text("structure_key").notNull(),
    flatKey: text("flat_key").notNull(),
    canonicalSmiles: text("canonical_smiles").notNull(),
    /** The molfile as given (molfile or SDF input); null when the structure came as SMILES. */
    molfile: text("molfile"),
    formula: text("formula").notNull(),
    mwGPerMol: doublePrecision("mw_g_per_mol").notNull(),
    exactMassDa: doublePrecision("exact_mass_da").notNull(),
    heavyAtoms: integer("heavy_atoms").notNull(),
    clogp: doublePrecision("clogp").notNull(),
    hbd: integer("hbd").notNull(),
    hba: integer("hba").notNull(),
    tpsaA2: doublePrecision("tpsa_a2").notNull(),
    rotatableBonds: integer("rotatable_bonds").notNull(),
    /** Screening fingerprint (src/lib/chem/fingerprint.ts) for the substructure prefilter. */
    fingerprint: bit("fingerprint", { dimensions: 1024 }).notNull(),
    distinctReason: text("distinct_reason"),
    registeredBy: text("registered_by").references(() => users.id, { onDelete: "set null" }),
    registeredAt: timestamp("registered_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("compounds_registry_id").on(t.registryId),
    uniqueIndex("compounds_registry_number").on(t.registryNumber),
    uniqueIndex("compounds_structure_key").on(t.structureKey),
    index("compounds_flat_key").on(t.flatKey),
    index("compounds_name_lower").on(sql`lower(${t.name})`),
    index("compounds_aliases").using("gin", t.aliases),
  ],
);

/** A physical lot of a compound. `batchNumber` counts from 1 per compound. */
export const compoundBatches = pgTable(
  "compound_batches",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    compoundId: uuid("compound_id")
      .notNull()
      .references(() => compounds.id, { onDelete: "cascade" }),
    batchNumber: integer("batch_number").notNull(),
    supplier: text("supplier"),
    purityPct: doublePrecision("purity_pct"),
    amount: doublePrecision("amount"),
    /** One of AMOUNT_UNITS in src/lib/chem/validation.ts (µg, mg, g, µL, mL). */
    amountUnit: text("amount_unit"),
    /** Salt or solvate form, e.g. "HCl" or the counter-ions removed from the input structure. */
    saltForm: text("salt_form"),
    /** Date received or made. */
    batchDate: date("batch_date"),
    notes: text("notes"),
    registeredBy: text("registered_by").references(() => users.id, { onDelete: "set null" }),
    registeredAt: timestamp("registered_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("compound_batches_number").on(t.compoundId, t.batchNumber)],
);

/** A stock solution made from a batch. */
export const stockSolutions = pgTable(
  "stock_solutions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    batchId: uuid("batch_id")
      .notNull()
      .references(() => compoundBatches.id, { onDelete: "cascade" }),
    concentrationMm: doublePrecision("concentration_mm"),
    solvent: text("solvent"),
    volumeUl: doublePrecision("volume_ul"),
    location: text("location"),
    madeOn: date("made_on"),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("stock_solutions_batch").on(t.batchId)],
);

/** A named set of compounds (e.g. "series B follow-up"). */
export const compoundLibraries = pgTable(
  "compound_libraries",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    name: text("name").notNull(),
    description: text("description"),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("compound_libraries_name").on(sql`lower(${t.name})`)],
);

export const libraryMembers = pgTable(
  "compound_library_members",
  {
    libraryId: uuid("library_id")
      .notNull()
      .references(() => compoundLibraries.id, { onDelete: "cascade" }),
    compoundId: uuid("compound_id")
      .notNull()
      .references(() => compounds.id, { onDelete: "cascade" }),
    addedBy: text("added_by").references(() => users.id, { onDelete: "set null" }),
    addedAt: timestamp("added_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.libraryId, t.compoundId] }),
    index("compound_library_members_compound").on(t.compoundId),
  ],
);

export const importStatus = pgEnum("compound_import_status", [
  "stored",
  "preparing",
  "ready",
  "failed",
  "committing",
  "committed",
]);
export const importMode = pgEnum("compound_import_mode", ["all_or_nothing", "valid_only"]);

/**
 * A bulk import: the file is stored in the object store under `s3Key` with its SHA-256 before it
 * is parsed; preparation runs in the background and writes `progressDone`/`progressTotal` here so
 * a reloaded page shows the same progress. `preview` holds the per-record issues and counts;
 * `result` the outcome of the commit (registry IDs, reasons).
 */
export const compoundImports = pgTable(
  "compound_imports",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    fileName: text("file_name").notNull(),
    sha256: text("sha256").notNull(),
    s3Key: text("s3_key").notNull(),
    sizeBytes: bigint("size_bytes", { mode: "number" }).notNull(),
    format: text("format").$type<ImportFormat>().notNull(),
    status: importStatus("status").notNull().default("stored"),
    progressDone: integer("progress_done").notNull().default(0),
    progressTotal: integer("progress_total").notNull().default(0),
    preview: jsonb("preview"),
    mode: importMode("mode"),
    result: jsonb("result"),
    error: text("error"),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
    committedAt: timestamp("committed_at", { withTimezone: true }),
  },
  (t) => [
    index("compound_imports_created").on(t.createdAt),
    check("compound_imports_format", oneOf(t.format, IMPORT_FORMATS)),
  ],
);

/**
 * The prepared records of an import, kept until it is committed: `data` holds the record and its
 * computed properties (so the commit does not parse again), `issues` why it cannot be registered.
 */
export const compoundImportRows = pgTable(
  "compound_import_rows",
  {
    importId: uuid("import_id")
      .notNull()
      .references(() => compoundImports.id, { onDelete: "cascade" }),
    recordNo: integer("record_no").notNull(),
    line: integer("line").notNull(),
    ok: boolean("ok").notNull(),
    data: jsonb("data"),
    issues: jsonb("issues"),
  },
  (t) => [primaryKey({ columns: [t.importId, t.recordNo] })],
);
