import "server-only";
import { z } from "zod";
import { looksLikeRegistryId } from "@/lib/registry-id";
import { AppError } from "./errors";

/**
 * The rules every request's path parameters, query string, JSON body and form fields pass before
 * a handler sees them (used by route() in http.ts and formAction() in action.ts, so they are
 * written once). They refuse what Postgres or the arithmetic would otherwise trip over — a NUL
 * character, text that is not well-formed UTF-16, an id that is not a UUID, a number beyond any
 * physical quantity, a date in the year 99999 — with a sentence naming the field. The schemas of
 * each route still decide what is valid for that route; these are the bounds for everything.
 */
export const EDGE_LIMITS = {
  /** Largest magnitude of any number accepted (a signal, a concentration in any unit, a count). */
  maxAbsNumber: 1e15,
  /** Dates outside these years are refused (assay data and schedules live well inside them). */
  minYear: 1900,
  maxYear: 2200,
  /** Longest path parameter and query value (JSON bodies are capped in http.ts). */
  maxParamChars: 200,
  maxQueryChars: 10_000,
  maxJsonDepth: 64,
} as const;

/** Names of path parameters, query keys and form fields that hold a row's UUID. */
export const UUID_KEYS = new Set([
  "campaignId",
  "experimentId",
  "analysisId",
  "runId",
  "importId",
  "viewId",
  "mapId",
  "plateMapId",
  "libraryId",
  "resultId",
  "batchId",
]);

/** Any UUID-shaped id (z.guid: 8-4-4-4-12 hex digits, any version), so a string of dashes never reaches a uuid cast. */
const uuidParam = z.guid();

/** Fields whose text is opaque (a password may well look like a date or a 17-digit number). */
const OPAQUE_KEY = /password|secret|token|^current$/i;

/** What is wrong with one text value, or null. `field` names it in the sentence. */
export function textProblem(field: string, value: string, opts: { opaque?: boolean } = {}): string | null {
  if (value.includes("\u0000")) return `${field} contains a NUL character, which is not allowed.`;
  if (!value.isWellFormed()) return `${field} contains text that is not valid Unicode (an unpaired surrogate).`;
  if (opts.opaque) return null;
  const date = /^([+-]?\d{4,})-(\d{2})-(\d{2})(?:[T ]|$)/.exec(value);
  if (date) {
    const year = Number(date[1]);
    if (year < EDGE_LIMITS.minYear || year > EDGE_LIMITS.maxYear)
      return `${field} has the year ${date[1]}; dates must lie between ${EDGE_LIMITS.minYear} and ${EDGE_LIMITS.maxYear}.`;
  }
  // A number written as text (forms, query strings): coerced later, so bounded here.
  if (/^\s*[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?\s*$/i.test(value) || /^\s*[+-]?infinity\s*$/i.test(value)) {
    const n = Number(value);
    if (!Number.isFinite(n) || Math.abs(n) > EDGE_LIMITS.maxAbsNumber)
      return `${field} is ${value.trim()}, outside the accepted range (±${EDGE_LIMITS.maxAbsNumber.toExponential()}).`;
  }
  return null;
}

/** A keyed value (query or form field): the text rules, and the UUID shape for id fields. */
export function fieldProblem(key: string, value: string): string | null {
  const name = `“${key.slice(0, 60)}”`;
  const p = textProblem(name, key) ?? textProblem(name, value, { opaque: OPAQUE_KEY.test(key) });
  if (p) return p;
  if (UUID_KEYS.has(key) && value !== "" && !uuidParam.safeParse(value).success) return `${name} must be a UUID.`;
  return null;
}

/**
 * Path parameters as Next.js gives them (decoded once, by its router — never decoded again
 * here): ids must be UUIDs, registry ids must have the registry-ID shape (src/lib/registry-id),
 * anything else must be short plain text. A parameter that fails is a resource that does not
 * exist: 404.
 */
export function checkParams(params: Record<string, unknown>): void {
  for (const [key, raw] of Object.entries(params)) {
    const values = Array.isArray(raw) ? raw : [raw];
    for (const v of values) {
      if (typeof v !== "string") throw new AppError("not_found", "Not found: the address is not valid.");
      const ok =
        v.length <= EDGE_LIMITS.maxParamChars &&
        textProblem(key, v) === null &&
        (UUID_KEYS.has(key)
          ? uuidParam.safeParse(v).success
          : key === "registryId"
            ? looksLikeRegistryId(v)
            : !/[\u0000-\u001f\u007f]/.test(v));
      if (!ok) throw new AppError("not_found", `Not found: the ${key} in the address is not valid.`);
    }
  }
}

/** The query string: every key and value passes the field rules; a bad one is a 400 naming it. */
export function checkQuery(url: string): void {
  const q = new URL(url).searchParams;
  for (const [k, v] of q) {
    if (k.length + v.length > EDGE_LIMITS.maxQueryChars)
      throw new AppError("bad_request", `The query parameter “${k.slice(0, 60)}” is too long.`);
    const p = fieldProblem(k, v);
    if (p) throw new AppError("bad_request", `The query parameter ${p}`, { details: [{ field: k, message: p }] });
  }
}

/**
 * A parsed JSON body, walked once: strings follow the text rules, numbers must be finite and
 * within ±maxAbsNumber (JSON.parse turns 1e999 into Infinity, and 1e308 overflows any product),
 * nesting is bounded. Throws a 400 naming the path of the first bad value.
 */
export function checkJson(value: unknown): void {
  const walk = (v: unknown, at: string, depth: number): void => {
    if (depth > EDGE_LIMITS.maxJsonDepth) throw bad(at, "is nested too deeply.");
    if (typeof v === "string") {
      const p = textProblem(at || "The body", v, { opaque: OPAQUE_KEY.test(at.split(".").at(-1) ?? "") });
      if (p) throw new AppError("bad_request", p, { details: [{ field: at || undefined, message: p }] });
    } else if (typeof v === "number") {
      if (!Number.isFinite(v) || Math.abs(v) > EDGE_LIMITS.maxAbsNumber)
        throw bad(at, `is ${v}, outside the accepted range (±${EDGE_LIMITS.maxAbsNumber.toExponential()}).`);
    } else if (Array.isArray(v)) {
      v.forEach((x, i) => walk(x, `${at}[${i}]`, depth + 1));
    } else if (v && typeof v === "object") {
      for (const [k, x] of Object.entries(v)) {
        const key = at ? `${at}.${k}` : k;
        const p = textProblem(`The key “${key.slice(0, 60)}”`, k);
        if (p) throw new AppError("bad_request", p);
        walk(x, key, depth + 1);
      }
    }
  };
  walk(value, "", 0);
}

function bad(at: string, what: string): AppError {
  const message = `${at ? `“${at}”` : "The body"} ${what}`;
  return new AppError("bad_request", message, { details: [{ field: at || undefined, message }] });
}
