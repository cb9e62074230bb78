import "server-only";
import { and, desc, eq, inArray, isNull, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { apiTokens, campaigns, memberships } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { audit } from "@/server/services/audit";
import type { SessionUser } from "@/server/auth/session";
import { TOKEN_DEFAULT_DAYS, TOKEN_MAX_DAYS, type TokenScope } from "@/lib/api-tokens";
import { newTokenSecret } from "./secret";

export type NewToken = { name: string; scope: TokenScope; campaignIds?: string[]; expiresInDays?: number };

/** Active tokens one person may hold at once: plenty for scripts, a bound on what a leak can mint. */
export const MAX_ACTIVE_TOKENS = 50;

const DAY_MS = 86_400_000;
const uuidShape = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * Creates a token for `owner` and returns its secret, the only time it exists outside the
 * caller's hands. Chosen campaigns must be ones the owner belongs to (an admin: any campaign).
 * The row and its audit entry commit together.
 */
export async function createToken(owner: SessionUser, input: NewToken, now = new Date()) {
  const days = input.expiresInDays ?? TOKEN_DEFAULT_DAYS;
  if (!Number.isInteger(days) || days < 1 || days > TOKEN_MAX_DAYS)
    throw new AppError("bad_request", `A token lasts 1 to ${TOKEN_MAX_DAYS} whole days; ${days} was asked for.`);
  const name = input.name.trim();
  if (!name) throw new AppError("bad_request", "A token needs a name.");
  const chosen = input.campaignIds?.length ? [...new Set(input.campaignIds)] : null;
  if (chosen) {
    const found =
      owner.globalRole === "admin"
        ? await db.select({ id: campaigns.id }).from(campaigns).where(inArray(campaigns.id, chosen))
        : await db
            .select({ id: memberships.campaignId })
            .from(memberships)
            .where(and(eq(memberships.userId, owner.id), inArray(memberships.campaignId, chosen)));
    const known = new Set(found.map((f) => f.id));
    const missing = chosen.filter((id) => !known.has(id));
    if (missing.length) throw new AppError("bad_request", `You are not a member of campaign ${missing[0]}.`);
  }
  const { secret, hash } = newTokenSecret();
  const expiresAt = new Date(now.getTime() + days * DAY_MS);
  const row = await db.transaction(async (tx) => {
    const [{ active }] = (await tx
      .select({ active: sql<number>`count(*)::int` })
      .from(apiTokens)
      .where(
        and(eq(apiTokens.userId, owner.id), isNull(apiTokens.revokedAt), sql`${apiTokens.expiresAt} > now()`),
      )) as [{ active: number }];
    if (active >= MAX_ACTIVE_TOKENS)
      throw new AppError(
        "conflict",
        `You already have ${active} active tokens, the most one person may hold. Revoke one you no longer use.`,
      );
    const [created] = await tx
      .insert(apiTokens)
      .values({ userId: owner.id, name, tokenHash: hash, scope: input.scope, campaignIds: chosen, expiresAt })
      .returning({ id: apiTokens.id, expiresAt: apiTokens.expiresAt });
    await audit(tx, owner, {
      action: "token.create",
      entityType: "api_token",
      entityId: created!.id,
      after: { name, scope: input.scope, campaignIds: chosen, expiresAt: expiresAt.toISOString() },
    });
    return created!;
  });
  return { id: row.id, token: secret, expiresAt: row.expiresAt.toISOString() };
}

export type TokenStatus = "active" | "expired" | "revoked";
export type TokenListItem = {
  id: string;
  name: string;
  scope: TokenScope;
  /** null: every campaign the owner belongs to. */
  campaigns: { id: string; name: string | null }[] | null;
  createdAt: string;
  lastUsedAt: string | null;
  expiresAt: string;
  revokedAt: string | null;
  status: TokenStatus;
};

/** The owner's tokens, newest first (never the secrets, which are not kept). */
export async function listTokens(owner: SessionUser, now = new Date()): Promise<TokenListItem[]> {
  const rows = await db
    .select()
    .from(apiTokens)
    .where(eq(apiTokens.userId, owner.id))
    .orderBy(desc(apiTokens.createdAt))
    .limit(500);
  const ids = [...new Set(rows.flatMap((r) => r.campaignIds ?? []))];
  const names = new Map(
    ids.length
      ? (
          await db.select({ id: campaigns.id, name: campaigns.name }).from(campaigns).where(inArray(campaigns.id, ids))
        ).map((c) => [c.id, c.name])
      : [],
  );
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    scope: r.scope,
    campaigns: r.campaignIds ? r.campaignIds.map((id) => ({ id, name: names.get(id) ?? null })) : null,
    createdAt: r.createdAt.toISOString(),
    lastUsedAt: r.lastUsedAt?.toISOString() ?? null,
    expiresAt: r.expiresAt.toISOString(),
    revokedAt: r.revokedAt?.toISOString() ?? null,
    status: r.revokedAt ? "revoked" : r.expiresAt <= now ? "expired" : "active",
  }));
}

/**
 * Revokes one of the owner's tokens at once (the next request with it gets 401). Another
 * person's token is 404, as if it did not exist; revoking twice changes nothing.
 */
export async function revokeToken(owner: SessionUser, tokenId: string): Promise<{ id: string; revokedAt: string }> {
  if (!uuidShape.test(tokenId)) throw new AppError("not_found", "No such token among yours.");
  return db.transaction(async (tx) => {
    const [t] = await tx
      .select({ id: apiTokens.id, name: apiTokens.name, revokedAt: apiTokens.revokedAt })
      .from(apiTokens)
      .where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, owner.id)))
      .for("update");
    if (!t) throw new AppError("not_found", "No such token among yours.");
    if (t.revokedAt) return { id: t.id, revokedAt: t.revokedAt.toISOString() };
    const [done] = await tx
      .update(apiTokens)
      .set({ revokedAt: sql`now()` })
      .where(eq(apiTokens.id, t.id))
      .returning({ revokedAt: apiTokens.revokedAt });
    await audit(tx, owner, {
      action: "token.revoke",
      entityType: "api_token",
      entityId: t.id,
      before: { name: t.name },
    });
    return { id: t.id, revokedAt: done!.revokedAt!.toISOString() };
  });
}
