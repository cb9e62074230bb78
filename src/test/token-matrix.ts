// The personal-token parts of the role matrix (src/server/registry.int.test.ts): invokers for the
// token routes, and the matrix run again with every signed-in caller holding a read or a
// read-write token instead of a session. Reference: issue 16 item 1 ("a read token never writes;
// a token never exceeds its owner's role"); the roles table in docs/product.md.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { callRoute, deniedRoute, makeWorld, userOf, useBearerTokens, type TestUser, type World } from "./harness";
import { registry, allActors, type RegistryActor } from "@/server/registry";
import { createToken } from "@/server/services/tokens";
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
