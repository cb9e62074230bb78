import { sql, type SQL } from "drizzle-orm";
import type { AnyPgColumn } from "drizzle-orm/pg-core";

/**
 * `column in (…)` over one of the shared const arrays (plate formats, inhibition models), for a
 * check constraint: the database refuses what the TypeScript type already rules out. The values
 * are constants of the code, never user input, so they are written into the SQL as literals.
 */
export function oneOf(column: AnyPgColumn, values: readonly (string | number)[]): SQL {
  const list = values.map((v) => (typeof v === "number" ? String(v) : `'${v.replace(/'/g, "''")}'`)).join(", ");
  return sql`${column} in (${sql.raw(list)})`;
}
