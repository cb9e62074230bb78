import "server-only";
import { AsyncLocalStorage } from "node:async_hooks";
import type { TokenScope } from "@/lib/api-tokens";
import type { SessionUser } from "./session";

/** What a personal API token grants in the request it authenticated. */
export type TokenGrant = { id: string; scope: TokenScope; campaignIds: string[] | null };

type RouteScope = {
  /** The secret of `Authorization: Bearer <secret>`, or null when the request has none. */
  bearer: string | null;
  method: string;
  req: Request;
  /** Set by the guard once the bearer token is valid. */
  grant?: TokenGrant;
  user?: SessionUser;
};

// Tokens are for route handlers only: route() (src/server/http.ts) opens this scope, so a server
// action or a page (browser-only) never sees one, whatever headers it was sent.
const store = new AsyncLocalStorage<RouteScope>();

/** The bearer secret of a request: null without an Authorization header of the Bearer scheme. */
export function bearerOf(req: Request): string | null {
  const h = req.headers.get("authorization");
  if (!h) return null;
  // "Bearer" with nothing after it is a token request with an empty (invalid) token, not a cookie request.
  const m = /^bearer(?:[ \t]+(.*))?$/i.exec(h.trim());
  return m ? (m[1] ?? "").trim() : null;
}

export function inRouteScope<T>(req: Request, fn: () => Promise<T>): Promise<T> {
  return store.run({ bearer: bearerOf(req), method: req.method.toUpperCase(), req }, fn);
}

export const routeScope = (): RouteScope | undefined => store.getStore();

/** The token of the current request, when it came with one (audit rows name it). */
export const currentTokenId = (): string | null => store.getStore()?.grant?.id ?? null;
