import "server-only";
import { sql, type SQL } from "drizzle-orm";
import { env } from "@/env";
import { formatRegistryId as format, REGISTRY_NUMBER_DIGITS, registryIdPattern } from "@/lib/registry-id";

/** The registry ID of number `n` with this deployment's prefix (rule: src/lib/registry-id.ts). */
export const formatRegistryId = (n: number): string => format(env.REGISTRY_PREFIX, n);

/** Matches the IDs this deployment issues. */
export const registryIdRe: RegExp = registryIdPattern(env.REGISTRY_PREFIX);

/** The same rule in SQL, for IDs issued in bulk inside one statement: `numberSql` is an integer expression. */
export function registryIdSql(numberSql: SQL): SQL {
  const max = 10 ** REGISTRY_NUMBER_DIGITS;
  return sql`${env.REGISTRY_PREFIX} || case when ${numberSql} < ${sql.raw(String(max))} then lpad((${numberSql})::text, ${sql.raw(String(REGISTRY_NUMBER_DIGITS))}, '0') else (${numberSql})::text end`;
}
