import "server-only";
import { eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { apiTokens, users } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { countAttempt } from "@/server/services/throttle";
import type { SessionUser } from "@/server/auth/session";
import type { TokenGrant } from "@/server/auth/route-scope";
import { tokenHashOf, tokenSecretShape } from "./secret";

// Prepared, like the session lookup: one query by hash on every token request.
const byHash = db
  .select({
    id: apiTokens.id,
    scope: apiTokens.scope,
    campaignIds: apiTokens.campaignIds,
    expiresAt: apiTokens.expiresAt,
    revokedAt: apiTokens.revokedAt,
    lastUsedAt: apiTokens.lastUsedAt,
    user: { id: users.id, email: users.email, name: users.name, globalRole: users.globalRole },
  })
  .from(apiTokens)
  .innerJoin(users, eq(users.id, apiTokens.userId))
  .where(eq(apiTokens.tokenHash, sql.placeholder("hash")))
  .limit(1)
  .prepare("api_token_by_hash");

const touch = db
  .update(apiTokens)
  .set({ lastUsedAt: sql`now()` })
  .where(eq(apiTokens.id, sql.placeholder("id")))
  .prepare("api_token_touch");

/** last_used_at is written at most once a minute per token, so busy scripts cost no extra writes. */
export const LAST_USED_RESOLUTION_MS = 60_000;

/**
 * The owner and grant of a bearer secret, or a 401 with a sentence. Failures count against the
 * caller's address like failed sign-ins (the sign-in address window in services/throttle.ts, in
 * a bucket of its own); a valid token is never throttled, since 256 random bits cannot be guessed.
 */
export async function authenticateToken(
  secret: string,
  address: string,
  now = new Date(),
): Promise<{ user: SessionUser; grant: TokenGrant }> {
  const row = tokenSecretShape.test(secret) ? (await byHash.execute({ hash: tokenHashOf(secret) }))[0] : undefined;
  let problem: string | null = null;
  if (!row) problem = "This API token is not valid. Check that it was copied whole, or create a new one in settings.";
  else if (row.revokedAt) problem = `This API token was revoked on ${row.revokedAt.toISOString().slice(0, 10)}.`;
  else if (row.expiresAt <= now)
    problem = `This API token expired on ${row.expiresAt.toISOString().slice(0, 10)}. Create a new one in settings.`;
  if (problem || !row) {
    await countAttempt([{ kind: "signin:address", key: `api-token|${address}` }]);
    throw new AppError("unauthorized", problem ?? undefined);
  }
  if (!row.lastUsedAt || now.getTime() - row.lastUsedAt.getTime() >= LAST_USED_RESOLUTION_MS)
    await touch.execute({ id: row.id });
  return { user: row.user, grant: { id: row.id, scope: row.scope, campaignIds: row.campaignIds } };
}
