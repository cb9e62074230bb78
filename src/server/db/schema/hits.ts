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
  primaryKey,
  bigint,
  check,
} from "drizzle-orm/pg-core";
import { sql } from "drizzle-orm";
import { users, campaigns } from "./auth";
import { oneOf } from "./checks";
import { triageStatuses } from "@/lib/hits/query";
import { INHIBITION_MODELS, type InhibitionModel } from "@/lib/kinetics/inhibition-models";

export const triageStatus = pgEnum("triage_status", triageStatuses);

/**
 * One row per (campaign, compound) with any current result: every figure the hit grid sorts or
 * filters on, denormalised so a sorted, filtered page of 100 out of 100,000 is an index scan.
 * Written only by refreshHitRows (src/server/services/hits/refresh.ts), inside the transaction that
 * changed what it summarises (analysis results, a mechanism override, a triage decision, a
 * comment). Concentrations in µM; LE in kcal/mol per heavy atom; MW in g/mol.
 */
export const hitRows = pgTable(
  "hit_rows",
  {
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    compoundId: text("compound_id").notNull(),
    name: text("name"),
    structureKey: text("structure_key"),
    pctInhibition: doublePrecision("pct_inhibition"),
    hit: boolean("hit"),
    ic50Um: doublePrecision("ic50_um"),
    ic50LoUm: doublePrecision("ic50_lo_um"),
    ic50HiUm: doublePrecision("ic50_hi_um"),
    ic50Qualifier: text("ic50_qualifier"),
    hill: doublePrecision("hill"),
    mechanism: text("mechanism").$type<InhibitionModel>(),
    mechanismLabel: text("mechanism_label"),
    mechanismOverridden: boolean("mechanism_overridden").notNull().default(false),
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
    /** Any flag, or a mechanism call with another model within ΔAICc 2: ranked after clean rows. */
    flagged: boolean("flagged").notNull().default(false),
    pKi: doublePrecision("p_ki"),
    le: doublePrecision("le"),
    lipe: doublePrecision("lipe"),
    mwGPerMol: doublePrecision("mw_g_per_mol"),
    clogp: doublePrecision("clogp"),
    heavyAtoms: integer("heavy_atoms"),
    status: triageStatus("status").notNull().default("unreviewed"),
    ownerId: text("owner_id").references(() => users.id, { onDelete: "set null" }),
    ownerName: text("owner_name"),
    statusChangedAt: timestamp("status_changed_at", { withTimezone: true }),
    lastTestedAt: timestamp("last_tested_at", { withTimezone: true }),
    commentCount: integer("comment_count").notNull().default(0),
    firstSeenAt: timestamp("first_seen_at", { withTimezone: true }).notNull().defaultNow(),
    kiFirstAt: timestamp("ki_first_at", { withTimezone: true }),
    refreshedAt: timestamp("refreshed_at", { withTimezone: true }).notNull().defaultNow(),
    /**
     * The row as the hits API returns it (hitJson's fields, as JSON text), written by the trigger
     * `hit_rows_item_json` on every insert and update (drizzle/0010), so a page is 100 stored
     * strings joined rather than 3,000 values formatted per request. Not read by anything else.
     */
    itemJson: text("item_json"),
  },
  (t) => [
    primaryKey({ columns: [t.campaignId, t.compoundId] }),
    // The ranked order: clean before flagged, then Ki, IC50, % inhibition (descending), ID.
    index("hit_rows_ranked").on(
      t.campaignId,
      t.flagged,
      sql`${t.kiUm} asc nulls last`,
      sql`${t.ic50Um} asc nulls last`,
      sql`${t.pctInhibition} desc nulls last`,
      t.compoundId,
    ),
    index("hit_rows_status").on(t.campaignId, t.status, t.compoundId),
    index("hit_rows_mechanism").on(t.campaignId, t.mechanism),
    check("hit_rows_mechanism", oneOf(t.mechanism, INHIBITION_MODELS)),
    index("hit_rows_ki").on(t.campaignId, t.kiUm, t.compoundId),
    index("hit_rows_ic50").on(t.campaignId, t.ic50Um, t.compoundId),
    index("hit_rows_pct").on(t.campaignId, t.pctInhibition, t.compoundId),
    index("hit_rows_le").on(t.campaignId, t.le, t.compoundId),
    index("hit_rows_lipe").on(t.campaignId, t.lipe, t.compoundId),
    index("hit_rows_mw").on(t.campaignId, t.mwGPerMol, t.compoundId),
    index("hit_rows_clogp").on(t.campaignId, t.clogp, t.compoundId),
    index("hit_rows_hill").on(t.campaignId, t.hill, t.compoundId),
    index("hit_rows_last_tested").on(t.campaignId, t.lastTestedAt, t.compoundId),
    // Descending sorts keep blanks last: a backward scan of the indexes above would put them
    // first, so the common descending sorts get their own index (measured in bench/hits.ts).
    ...(
      [
        ["ki", t.kiUm],
        ["ic50", t.ic50Um],
        ["pct", t.pctInhibition],
        ["le", t.le],
        ["lipe", t.lipe],
        ["mw", t.mwGPerMol],
        ["clogp", t.clogp],
        ["hill", t.hill],
        ["last_tested", t.lastTestedAt],
      ] as const
    ).map(([name, col]) =>
      index(`hit_rows_${name}_desc`).on(t.campaignId, sql`${col} desc nulls last`, sql`${t.compoundId} desc`),
    ),
  ],
);

/**
 * A counter per campaign, bumped by every refreshHitRows in the same transaction: the API keeps
 * the total of a filter (a count over up to 100,000 rows) until the counter moves.
 */
export const hitRowVersions = pgTable("hit_row_versions", {
  campaignId: uuid("campaign_id")
    .primaryKey()
    .references(() => campaigns.id, { onDelete: "cascade" }),
  version: bigint("version", { mode: "number" }).notNull().default(0),
});

/** Every triage status change: who, when, from, to, why. Append-only by use (also audited). */
export const triageDecisions = pgTable(
  "triage_decisions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    compoundId: text("compound_id").notNull(),
    fromStatus: triageStatus("from_status").notNull(),
    toStatus: triageStatus("to_status").notNull(),
    comment: text("comment"),
    by: text("by").references(() => users.id, { onDelete: "set null" }),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("triage_decisions_compound").on(t.campaignId, t.compoundId, t.at),
    index("triage_decisions_campaign_at").on(t.campaignId, t.at),
  ],
);

/** Comments on a compound in a campaign (members with campaign:comment). */
export const hitComments = pgTable(
  "hit_comments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    compoundId: text("compound_id").notNull(),
    body: text("body").notNull(),
    by: text("by").references(() => users.id, { onDelete: "set null" }),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("hit_comments_compound").on(t.campaignId, t.compoundId, t.at)],
);

/** A person's named grid view in a campaign: column state, filters and sort. */
export const hitViews = pgTable(
  "hit_views",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    state: jsonb("state").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("hit_views_name").on(t.userId, t.campaignId, sql`lower(${t.name})`)],
);
