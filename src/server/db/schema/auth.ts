import {
  pgTable,
  text,
  timestamp,
  uuid,
  primaryKey,
  integer,
  index,
  uniqueIndex,
  pgEnum,
  doublePrecision,
} from "drizzle-orm/pg-core";
import { sql } from "drizzle-orm";
import { campaignRoles, globalRoles } from "@/lib/roles";

export const globalRole = pgEnum("global_role", globalRoles);
export const campaignRole = pgEnum("campaign_role", campaignRoles);

export const users = pgTable(
  "users",
  {
    id: text("id").primaryKey(),
    email: text("email").notNull(),
    name: text("name").notNull(),
    passwordHash: text("password_hash"),
    globalRole: globalRole("global_role").notNull().default("member"),
    digestOptOut: timestamp("digest_opt_out_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    passwordChangedAt: timestamp("password_changed_at", { withTimezone: true }),
  },
  (t) => [uniqueIndex("users_email_lower").on(sql`lower(${t.email})`)],
);

/** lucia's session table (column names fixed by @lucia-auth/adapter-drizzle). */
export const sessions = pgTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: timestamp("expires_at", { withTimezone: true, mode: "date" }).notNull(),
  },
  (t) => [index("sessions_user").on(t.userId)],
);

export const campaigns = pgTable("campaigns", {
  id: uuid("id").primaryKey().defaultRandom(),
  name: text("name").notNull(),
  targetEnzyme: text("target_enzyme").notNull(),
  substrate: text("substrate"),
  kmValue: doublePrecision("km_value"),
  kmUnit: text("km_unit"),
  enzymeConcValue: doublePrecision("enzyme_conc_value"),
  enzymeConcUnit: text("enzyme_conc_unit"),
  assayNotes: text("assay_notes"),
  qcMinZPrime: doublePrecision("qc_min_z_prime").notNull().default(0.5),
  qcMaxCvPct: doublePrecision("qc_max_cv_pct").notNull().default(20),
  hitThresholdPct: doublePrecision("hit_threshold_pct").notNull().default(50),
  timeZone: text("time_zone").notNull().default("UTC"),
  digestWeekday: integer("digest_weekday").notNull().default(1),
  digestHour: integer("digest_hour").notNull().default(7),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  createdBy: text("created_by").references(() => users.id),
});

export const memberships = pgTable(
  "memberships",
  {
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: campaignRole("role").notNull(),
    addedAt: timestamp("added_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.campaignId, t.userId] }), index("memberships_user").on(t.userId)],
);

export const invitations = pgTable("invitations", {
  id: uuid("id").primaryKey().defaultRandom(),
  email: text("email").notNull(),
  campaignId: uuid("campaign_id")
    .notNull()
    .references(() => campaigns.id, { onDelete: "cascade" }),
  role: campaignRole("role").notNull(),
  tokenHash: text("token_hash").notNull().unique(),
  invitedBy: text("invited_by").references(() => users.id),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  usedAt: timestamp("used_at", { withTimezone: true }),
  revokedAt: timestamp("revoked_at", { withTimezone: true }),
});

export const passwordResets = pgTable("password_resets", {
  id: uuid("id").primaryKey().defaultRandom(),
  userId: text("user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  tokenHash: text("token_hash").notNull().unique(),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  usedAt: timestamp("used_at", { withTimezone: true }),
});

/**
 * Attempt counters for throttling, one row per (kind, key, window). Kept in Postgres so a limit
 * holds across processes and restarts.
 */
export const throttle = pgTable(
  "throttle",
  {
    bucket: text("bucket").notNull(),
    windowStart: timestamp("window_start", { withTimezone: true }).notNull(),
    count: integer("count").notNull().default(0),
    lastAt: timestamp("last_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.bucket, t.windowStart] })],
);
