import { pgTable, text, timestamp, uuid, integer, uniqueIndex, index, pgEnum, primaryKey } from "drizzle-orm/pg-core";
import { users, campaigns } from "./auth";

export const digestStatus = pgEnum("digest_status", ["pending", "sending", "sent", "failed"]);

/**
 * One weekly digest for one recipient of one campaign. The unique (campaign, user, week) row is
 * what makes "never twice" hold in Postgres: a second send in the same week, a retry or a second
 * worker finds the row and does not send again; the same key goes to the e-mail API as its
 * idempotency key, so even a send whose answer was lost is not repeated.
 */
export const digestSends = pgTable(
  "digest_sends",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** Monday of the ISO week (in the campaign's time zone) the digest belongs to, YYYY-MM-DD. */
    week: text("week").notNull(),
    email: text("email").notNull(),
    status: digestStatus("status").notNull().default("pending"),
    attempts: integer("attempts").notNull().default(0),
    idempotencyKey: text("idempotency_key").notNull(),
    messageId: text("message_id"),
    lastError: text("last_error"),
    trigger: text("trigger").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    claimedAt: timestamp("claimed_at", { withTimezone: true }),
    sentAt: timestamp("sent_at", { withTimezone: true }),
    nextAttemptAt: timestamp("next_attempt_at", { withTimezone: true }),
  },
  (t) => [
    uniqueIndex("digest_sends_once").on(t.campaignId, t.userId, t.week),
    index("digest_sends_campaign").on(t.campaignId, t.createdAt),
  ],
);

/** A member who stopped the weekly digest of a campaign (from the e-mail's signed link or settings). */
export const digestOptOuts = pgTable(
  "digest_opt_outs",
  {
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
    via: text("via").notNull(),
  },
  (t) => [primaryKey({ columns: [t.campaignId, t.userId] })],
);
