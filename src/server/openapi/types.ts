import "server-only";
import type { z } from "zod";

export type HttpMethod = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";

/** How a caller proves who they are: `public` needs nothing; `session` only the browser session; `any` session or a personal token. */
export type ApiAuth = "public" | "session" | "any";

export type ApiResponse = {
  description: string;
  /** The zod shape of the body, when the route has one; otherwise the description says what comes back. */
  schema?: z.ZodType;
  /** Defaults to application/json. */
  contentType?: string;
};

/**
 * One route handler as the API document describes it. Its registry id
 * (`src/app/api/…/route.ts#METHOD`) is computed from method and path, so the document cannot name
 * a route the registry does not know (the document test checks both directions). Request schemas
 * are the very zod objects the route validates with, imported from the `schema.ts` beside it.
 */
export type ApiOperation = {
  method: HttpMethod;
  /** OpenAPI path template, e.g. `/api/campaigns/{campaignId}/plate-maps`. */
  path: string;
  summary: string;
  description?: string;
  auth?: ApiAuth;
  /** The route's path-parameter validator, when it has one (others are plain strings checked by the edge rules). */
  params?: z.ZodObject;
  query?: z.ZodObject;
  body?: { schema: z.ZodType; kind: "json" | "multipart"; example?: unknown };
  /** Success answers by status; the usual error answers (400/401/403/404/429) are added by the builder. */
  responses: Record<number, ApiResponse>;
};

export function registryIdOf(op: Pick<ApiOperation, "method" | "path">): string {
  return `src/app${op.path.replace(/\{([^}]+)\}/g, "[$1]")}/route.ts#${op.method}`;
}
