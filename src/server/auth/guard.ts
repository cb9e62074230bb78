import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { headers } from "next/headers";
import { db } from "@/server/db/client";
import { campaigns, memberships } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { can, type Capability, type CampaignRole } from "@/lib/roles";
import { getCurrentSession, type SessionUser } from "./session";
import { proxyMatcher, resolveClientAddress } from "./client-address";
import { env } from "@/env";
import { READ_CAPABILITIES } from "@/lib/api-tokens";
import { bearerOf, routeScope, type TokenGrant } from "./route-scope";
import { authenticateToken } from "@/server/services/tokens/authenticate";

/**
 * The one guard module. Every server action and route handler calls one of these before it
 * reads or writes anything; the UI hiding a button is never the check.
 */
export async function requireUser(): Promise<SessionUser> {
  const scope = routeScope();
  if (scope?.bearer != null) return tokenUser(scope);
  const { user } = await getCurrentSession();
  if (!user) throw new AppError("unauthorized");
  return user;
}

const SAFE_METHODS = ["GET", "HEAD"];

/**
 * A route request with `Authorization: Bearer`: the token alone decides (a cookie sent beside it
 * is ignored). A read token is refused any method that writes, whatever the route asks for.
 */
async function tokenUser(scope: NonNullable<ReturnType<typeof routeScope>>): Promise<SessionUser> {
  if (!scope.grant || !scope.user) {
    const { user, grant } = await authenticateToken(scope.bearer!, await clientAddress(scope.req));
    scope.user = user;
    scope.grant = grant;
  }
  if (scope.grant.scope === "read" && !SAFE_METHODS.includes(scope.method))
    throw new AppError("forbidden", "This API token is read-only; create a read-write token to make changes.");
  return scope.user;
}

/** The token of this request, when it came with one. */
const grantOf = (): TokenGrant | null => routeScope()?.grant ?? null;

/**
 * A read token holds the read capabilities, and on a safe method (GET/HEAD, which never change
 * anything: RFC 9110 §9.2.1) whatever its owner may read (a lead's digest log is read behind
 * `digest:send`). Every other method was refused already in tokenUser; this is the second line.
 */
function tokenAllows(grant: TokenGrant | null, cap: Capability): boolean {
  if (!grant || grant.scope === "read-write") return true;
  return (READ_CAPABILITIES as readonly Capability[]).includes(cap) || SAFE_METHODS.includes(routeScope()!.method);
}
const readOnlyToken = () =>
  new AppError("forbidden", "This API token is read-only; create a read-write token to make changes.");

/** Was a campaign left out of the request's token? (No token: nothing is left out.) */
export function tokenExcludesCampaign(campaignId: string): boolean {
  const grant = grantOf();
  return !!grant?.campaignIds && !grant.campaignIds.includes(campaignId);
}

/** Refuses a personal API token (creating tokens needs a signed-in browser session). */
export async function requireSessionUser(): Promise<SessionUser> {
  const user = await requireUser();
  if (grantOf()) throw new AppError("forbidden", "An API token cannot do this; sign in and use the settings page.");
  return user;
}

export async function requireAdmin(): Promise<SessionUser> {
  const user = await requireUser();
  if (user.globalRole !== "admin") throw new AppError("forbidden", "Only an administrator can do this.");
  if (grantOf()?.campaignIds)
    throw new AppError("forbidden", "This API token is limited to chosen campaigns; administration needs another.");
  return user;
}

const uuidRe = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export type CampaignAccess = {
  user: SessionUser;
  campaign: typeof campaigns.$inferSelect;
  role: CampaignRole | null; // null: an admin who is not a member
};

// Prepared: every campaign request runs it, and building and planning it each time cost three
// times its prepared cost in server CPU (see lucia.ts).
const campaignAccess = db
  .select({ campaign: campaigns, role: memberships.role })
  .from(campaigns)
  .leftJoin(
    memberships,
    and(eq(memberships.campaignId, campaigns.id), eq(memberships.userId, sql.placeholder("userId"))),
  )
  .where(eq(campaigns.id, sql.placeholder("campaignId")))
  .limit(1)
  .prepare("campaign_access");

/**
 * A campaign the user may see, and a capability in it. Someone who is not a member gets 404
 * (the campaign's existence is not revealed); a member whose role lacks the capability, 403.
 */
export async function requireCampaign(campaignId: string, cap: Capability = "campaign:read"): Promise<CampaignAccess> {
  const user = await requireUser();
  if (!uuidRe.test(campaignId)) throw new AppError("not_found", "No such campaign.");
  const [row] = await campaignAccess.execute({ userId: user.id, campaignId });
  if (!row || (row.role === null && user.globalRole !== "admin") || tokenExcludesCampaign(campaignId))
    throw new AppError("not_found", "No such campaign.");
  if (!can(user.globalRole, row.role, cap)) throw new AppError("forbidden");
  if (!tokenAllows(grantOf(), cap)) throw readOnlyToken();
  return { user, campaign: row.campaign, role: row.role };
}

/**
 * A capability held in any campaign (compounds are shared across campaigns: a chemist of any
 * campaign registers them).
 */
export async function requireCapabilityAnywhere(cap: Capability): Promise<SessionUser> {
  const user = await requireUser();
  if (!tokenAllows(grantOf(), cap)) throw readOnlyToken();
  if (user.globalRole === "admin") return user;
  const roles = await db
    .select({ role: memberships.role, campaignId: memberships.campaignId })
    .from(memberships)
    .where(eq(memberships.userId, user.id));
  // A campaign-limited token counts only the roles held in its campaigns.
  if (!roles.some((r) => can("member", r.role, cap) && !tokenExcludesCampaign(r.campaignId)))
    throw new AppError("forbidden", "Your roles do not allow this.");
  return user;
}

/**
 * Mutating requests must come from our own pages: a browser's Origin (when sent) must match
 * the Host, and a cross-site fetch is refused.
 */
export async function requireSameOrigin(req?: Request): Promise<void> {
  // A token request is no browser session: no cookie is used, so there is nothing to forge.
  if (req && bearerOf(req) !== null) return;
  const h = req ? req.headers : await headers();
  const origin = h.get("origin");
  const host = h.get("x-forwarded-host") ?? h.get("host");
  if (h.get("sec-fetch-site") === "cross-site") throw new AppError("bad_origin");
  if (origin && origin !== "null") {
    let originHost: string;
    try {
      originHost = new URL(origin).host;
    } catch {
      throw new AppError("bad_origin");
    }
    if (!host || originHost !== host) throw new AppError("bad_origin");
  } else if (origin === "null") {
    throw new AppError("bad_origin");
  }
}

const isTrustedProxy = proxyMatcher(env.TRUSTED_PROXIES);

/** The client's address for throttling (see resolveClientAddress: TRUSTED_PROXIES decides whose X-Forwarded-For counts). */
export async function clientAddress(req?: Request): Promise<string> {
  const h = req ? req.headers : await headers();
  return resolveClientAddress(h, isTrustedProxy);
}
