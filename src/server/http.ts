import "server-only";
import { NextResponse } from "next/server";
import type { z } from "zod";
import { AppError, isNextControlFlow, toPublicError } from "./errors";
import { requireSameOrigin } from "./auth/guard";
import { inRouteScope } from "./auth/route-scope";
import { checkJson, checkParams, checkQuery } from "./edge-input";
import { readBodyCapped } from "./multipart";

type Ctx<P> = { params: Promise<P> };

/**
 * Every route handler goes through here: a mutating request is checked for its origin, the path
 * parameters (decoded once, by Next's router) and the query string pass the edge rules
 * (src/server/edge-input.ts: UUIDs, registry ids, no NUL, bounded numbers and dates), then the
 * handler runs (it calls the guard first), and anything thrown becomes a JSON error with the
 * right status — never a stack trace.
 */
export function route<P = Record<string, never>>(fn: (req: Request, params: P) => Promise<Response>) {
  return async (req: Request, ctx: Ctx<P>): Promise<Response> => {
    try {
      if (!["GET", "HEAD", "OPTIONS"].includes(req.method)) await requireSameOrigin(req);
      const params = ctx ? await ctx.params : ({} as P);
      checkParams((params ?? {}) as Record<string, unknown>);
      checkQuery(req.url);
      // The scope lets the guard accept `Authorization: Bearer` here, and only here (not in actions or pages).
      return await inRouteScope(req, () => fn(req, params));
    } catch (e) {
      if (isNextControlFlow(e)) throw e;
      const { status, body } = toPublicError(e);
      // A refusal for load or throttling says how long to wait (retryAfterSeconds, set where it is thrown).
      const wait = typeof body.retryAfterSeconds === "number" ? Math.max(1, Math.ceil(body.retryAfterSeconds)) : 60;
      return NextResponse.json(body, { status, headers: status === 429 ? { "retry-after": String(wait) } : undefined });
    }
  };
}

/** JSON bodies are forms and settings, never files; the largest is a 1,000,000-character molfile (chosen here). */
export const MAX_JSON_BYTES = 2 * 1024 * 1024;

/** Reads a JSON body with its byte cap enforced while it streams (Content-Length may be absent or wrong). */
export async function parseJson<S extends z.ZodType>(req: Request, schema: S): Promise<z.infer<S>> {
  const bytes = await readBodyCapped(req, MAX_JSON_BYTES, "The request body");
  let raw: unknown;
  try {
    raw = JSON.parse(new TextDecoder().decode(bytes));
  } catch {
    throw new AppError("bad_request", "The request body must be JSON.");
  }
  checkJson(raw);
  return schema.parse(raw);
}

export function parseQuery<S extends z.ZodType>(req: Request, schema: S): z.infer<S> {
  const url = new URL(req.url);
  return schema.parse(Object.fromEntries(url.searchParams.entries()));
}

export const json = (data: unknown, status = 200) => NextResponse.json(data, { status });
