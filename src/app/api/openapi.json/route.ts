import { buildOpenApiDocument } from "@/server/openapi";
import { json, route } from "@/server/http";

export const dynamic = "force-dynamic";

let cached: ReturnType<typeof buildOpenApiDocument> | null = null;

/**
 * Public on purpose, like /api/health: a script (or a client generator) reads it before it has a
 * token. It holds the shapes of requests and who may call each route, never data or secrets.
 */
export const GET = route(async () => {
  cached ??= buildOpenApiDocument();
  return json(cached);
});
