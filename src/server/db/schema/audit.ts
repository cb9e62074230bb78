import { pgTable, text, timestamp, uuid, bigserial, jsonb, index } from "drizzle-orm/pg-core";
import { users, campaigns } from "./auth";

/**
 * Append-only record of every change that feeds a decision. A trigger (migration
 * 0001_audit_append_only) refuses UPDATE and DELETE, so rows can only be added, and each row is
 * written in the same transaction as the change it records.
 */
export const auditLog = pgTable(
  "audit_log",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
    actorId: text("actor_id").references(() => users.id, { onDelete: "set null" }),
    actorEmail: text("actor_email"),
    campaignId: uuid("campaign_id").references(() => campaigns.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    entityType: text("entity_type").notNull(),
    entityId: text("entity_id"),
    before: jsonb("before"),
    after: jsonb("after"),
    reason: text("reason"),
    // The personal API token the change came through (api_tokens.id; no foreign key, so the
    // append-only rows never need an update), null for a browser session or a job.
    tokenId: uuid("token_id"),
  },
  (t) => [index("audit_campaign_at").on(t.campaignId, t.at), index("audit_at").on(t.at)],
);
