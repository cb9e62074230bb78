import { pgTable, text, timestamp, uuid, index, uniqueIndex, check } from "drizzle-orm/pg-core";
import { oneOf } from "./checks";
import { users } from "./auth";
import { TOKEN_SCOPES } from "@/lib/api-tokens";

/**
 * Personal API tokens. Only the SHA-256 (hex) of the secret is stored; the secret is shown once.
 * A token is revoked by setting revoked_at, never deleted, so the audit rows that name it keep
 * their meaning. campaign_ids null means every campaign the owner belongs to.
 */
export const apiTokens = pgTable(
  "api_tokens",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    tokenHash: text("token_hash").notNull(),
    scope: text("scope", { enum: TOKEN_SCOPES }).notNull(),
    campaignIds: uuid("campaign_ids").array(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    lastUsedAt: timestamp("last_used_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [
    uniqueIndex("api_tokens_hash").on(t.tokenHash),
    index("api_tokens_user").on(t.userId),
    check("api_tokens_scope", oneOf(t.scope, TOKEN_SCOPES)),
  ],
);
