import "server-only";

/**
 * Small database helpers used by every service: one definition each.
 */

const field = (x: unknown, k: string): unknown =>
  typeof x === "object" && x !== null && k in x ? (x as Record<string, unknown>)[k] : undefined;

/**
 * True when `e` (or the error it wraps: drizzle wraps postgres.js errors in `cause`) is a unique
 * violation (SQLSTATE 23505), optionally of the named constraint.
 */
export function isUniqueViolation(e: unknown, constraint?: string): boolean {
  for (const err of [e, field(e, "cause")]) {
    if (field(err, "code") !== "23505") continue;
    if (!constraint || field(err, "constraint_name") === constraint || field(err, "constraint") === constraint)
      return true;
  }
  return false;
}

/** Escapes LIKE/ILIKE wildcards (% _ and the escape character \) so user text matches literally. */
export const escapeLike = (s: string): string => s.replace(/[\\%_]/g, (m) => `\\${m}`);

/** `%text%` for a literal "contains" match with ILIKE. */
export const containsPattern = (s: string): string => `%${escapeLike(s)}%`;
