/**
 * The registry-ID format, defined once: a prefix (env REGISTRY_PREFIX, e.g. "INH-": a capital,
 * up to seven capitals or digits, then a hyphen) and the registry number, zero-padded to six
 * digits; numbers from 1,000,000 on are written in full (INH-1234567). Pure: the prefix is an
 * argument so the client, the demo data and the tests share the rule; the server binds it to the
 * environment in src/server/registry-id.ts. The SQL that issues IDs in bulk is built by
 * `registryIdSql` from the same constants.
 */

/** The prefix when REGISTRY_PREFIX is not set (env.ts); the invented demo data and tests use it. */
export const DEFAULT_REGISTRY_PREFIX = "INH-";

/** Digits the number is padded to. */
export const REGISTRY_NUMBER_DIGITS = 6;

/** What a prefix looks like (env.ts validates REGISTRY_PREFIX with it). */
export const REGISTRY_PREFIX_RE = /^[A-Z][A-Z0-9]{0,7}-$/;

/** Any well-formed registry ID of any prefix, case-insensitive, for parsing pasted lists and URLs. */
export const REGISTRY_ID_SHAPE = /[A-Za-z][A-Za-z0-9]{0,7}-\d{1,10}/;

/** "INH-" + 123 → "INH-000123"; 1234567 → "INH-1234567". */
export function formatRegistryId(prefix: string, n: number): string {
  if (!Number.isSafeInteger(n) || n < 1) throw new RangeError(`registry number must be a positive integer, got ${n}`);
  return `${prefix}${String(n).padStart(REGISTRY_NUMBER_DIGITS, "0")}`;
}

const escapeRe = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/** Matches exactly the IDs this prefix issues (six or more digits), whole string. */
export function registryIdPattern(prefix: string): RegExp {
  return new RegExp(`^${escapeRe(prefix)}\\d{${REGISTRY_NUMBER_DIGITS},}$`);
}

/** True when `text` is an ID of any prefix (the shape of a registry ID, whole string). */
export function looksLikeRegistryId(text: string): boolean {
  return new RegExp(`^${REGISTRY_ID_SHAPE.source}$`).test(text);
}

/** The number behind an ID of this prefix, or null when it is not one. */
export function registryNumber(prefix: string, id: string): number | null {
  if (!registryIdPattern(prefix).test(id)) return null;
  return Number(id.slice(prefix.length));
}
