// The personal-token parts of the role matrix (src/server/registry.int.test.ts): invokers for the
// token routes, and the matrix run again with every signed-in caller holding a read or a
// read-write token instead of a session. Reference: issue 16 item 1 ("a read token never writes;
// a token never exceeds its owner's role"); the roles table in docs/product.md.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { callRoute, deniedRoute, makeWorld, userOf, useBearerTokens, type TestUser, type World } from "./harness";
import { registry, allActors, type RegistryActor } from "@/server/registry";
import { createToken } from "@/server/services/tokens";
import { db } from "@/server/db/client";
import { apiTokens, throttle } from "@/server/db/schema";
import { eq, like, sql } from "drizzle-orm";
import { TOKEN_SCOPES, type TokenScope } from "@/lib/api-tokens";
import * as tokensRoute from "@/app/api/tokens/route";
import * as tokenRoute from "@/app/api/tokens/[tokenId]/route";

type Invoke = (actor: RegistryActor, w: World) => Promise<boolean>;

/** A session user for the service (the global role only matters for campaign lists, unused here). */
export const ownerOf = (u: TestUser) => ({ ...u, globalRole: "member" as const });

export const tokenInvokers: Record<string, Invoke> = {
  "src/app/api/tokens/route.ts#GET": async (actor, w) =>
    deniedRoute((await callRoute(tokensRoute.GET, { user: userOf(w, actor), path: "/api/tokens" })).status),
  "src/app/api/tokens/route.ts#POST": async (actor, w) =>
    deniedRoute(
      (
        await callRoute(tokensRoute.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: "/api/tokens",
          body: { name: `Matrix ${actor}`, scope: "read", expiresInDays: 1 },
        })
      ).status,
    ),
  "src/app/api/tokens/[tokenId]/route.ts#DELETE": async (actor, w) => {
    // Each caller revokes a token of their own; signed out, the lead's.
    const owner = userOf(w, actor) ?? w.people.lead;
    const { id } = await createToken(ownerOf(owner), { name: `To revoke ${actor}`, scope: "read", expiresInDays: 1 });
    return deniedRoute(
      (
        await callRoute(tokenRoute.DELETE, {
          user: userOf(w, actor),
          method: "DELETE",
          path: `/api/tokens/${id}`,
          params: { tokenId: id },
        })
      ).status,
    );
  },
};

const SAFE = ["GET", "HEAD"];

/** What a caller holding a token of `scope` may do: the owner's allowance, less writes for read tokens, less session-only routes. */
export function tokenExpectation(
  entry: (typeof registry)[number],
  actor: RegistryActor,
  scope: TokenScope,
): "allowed" | "denied" {
  const owner = entry.allow.includes(actor);
  if (actor === "signedOut") return owner ? "allowed" : "denied"; // no token to send
  const method = entry.id.split("#")[1]!;
  const ok = owner && !entry.sessionOnly && (scope === "read-write" || SAFE.includes(method));
  return ok ? "allowed" : "denied";
}

/** Every route handler in the registry, called with a read and with a read-write token of each kind of person. */
export function tokenMatrix(invokers: Record<string, Invoke>): void {
  const routes = registry.filter((e) => /\/route\.ts#/.test(e.id));
  for (const scope of TOKEN_SCOPES) {
    describe(`role matrix with ${scope} tokens`, () => {
      let world: World;
      const secrets = new Map<string, Promise<string>>();
      beforeAll(async () => {
        world = await makeWorld();
        useBearerTokens((u) => {
          // One token per person for the whole run, so nobody reaches the cap on active tokens.
          if (!secrets.has(u.id))
            secrets.set(
              u.id,
              createToken(ownerOf(u), { name: `Matrix ${scope}`, scope, expiresInDays: 1 }).then((t) => t.token),
            );
          return secrets.get(u.id)!;
        });
      });
      afterAll(() => useBearerTokens(null));
      for (const entry of routes) {
        for (const actor of allActors) {
          const expected = tokenExpectation(entry, actor, scope);
          it(`${entry.id} with ${actor}'s ${scope} token is ${expected}`, async () => {
            const denied = await invokers[entry.id]!(actor, world);
            expect(denied ? "denied" : "allowed").toBe(expected);
          });
        }
      }
    });
  }
}

type Broken = "revoked" | "expired" | "limited to another campaign";

/**
 * Tokens that must open nothing: revoked and expired read-write tokens on every route (only the
 * public ones answer), and read-write tokens limited to the world's other campaign on every route
 * of the world's campaign (404 even for its lead and for an admin).
 */
export function brokenTokenMatrix(invokers: Record<string, Invoke>): void {
  const all = registry.filter((e) => /\/route\.ts#/.test(e.id));
  for (const kind of ["revoked", "expired", "limited to another campaign"] as Broken[]) {
    const routes = kind === "limited to another campaign" ? all.filter((e) => e.id.includes("[campaignId]")) : all;
    describe(`role matrix with ${kind} tokens`, () => {
      let world: World;
      const secrets = new Map<string, Promise<string>>();
      const mint = async (u: TestUser) => {
        const t = await createToken(ownerOf(u), {
          name: `Matrix ${kind}`,
          scope: "read-write",
          expiresInDays: 1,
          ...(kind === "limited to another campaign" ? { campaignIds: [world.otherCampaignId] } : {}),
        }).catch(async (e) => {
          // Only the non-member belongs to the other campaign; the others' limit is set directly.
          if (kind !== "limited to another campaign") throw e;
          const t = await createToken(ownerOf(u), { name: `Matrix ${kind}`, scope: "read-write", expiresInDays: 1 });
          await db
            .update(apiTokens)
            .set({ campaignIds: [world.otherCampaignId] })
            .where(eq(apiTokens.id, t.id));
          return t;
        });
        if (kind === "revoked")
          await db
            .update(apiTokens)
            .set({ revokedAt: sql`now()` })
            .where(eq(apiTokens.id, t.id));
        if (kind === "expired")
          await db
            .update(apiTokens)
            .set({ expiresAt: sql`now() - interval '1 second'` })
            .where(eq(apiTokens.id, t.id));
        return t.token;
      };
      beforeAll(async () => {
        world = await makeWorld();
        useBearerTokens((u) => {
          if (!secrets.has(u.id)) secrets.set(u.id, mint(u));
          return secrets.get(u.id)!;
        });
      });
      afterAll(() => useBearerTokens(null));
      // Every call here is a failed token attempt: the address window (300) would soon answer 429.
      beforeEach(async () => {
        await db.delete(throttle).where(like(throttle.bucket, "signin:address:api-token|%"));
      });
      for (const entry of routes) {
        for (const actor of allActors) {
          // Public routes never look at credentials; every other route refuses these tokens.
          const expected = entry.allow.includes("signedOut") ? "allowed" : "denied";
          it(`${entry.id} with ${actor}'s ${kind} token is ${expected}`, async () => {
            const denied = await invokers[entry.id]!(actor, world);
            expect(denied ? "denied" : "allowed").toBe(expected);
          });
        }
      }
    });
  }
}
