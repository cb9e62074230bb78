// The registry-ID rule written in SQL (registryIdSql, used when an import issues IDs in bulk) checked
// against its TypeScript owner (formatRegistryId), with Postgres evaluating the SQL. Common practice:
// a registry ID is a prefix and a zero-padded serial number; this product pads to six digits and
// writes larger numbers in full. The structures imported here are INVENTED test molecules.
import { describe, it, expect, beforeAll } from "vitest";
import { inArray, sql } from "drizzle-orm";
import { makeWorld, type World } from "@/test/harness";
import { importFile, uniqueSmiles } from "@/test/compounds";
import { db } from "@/server/db/client";
import { compounds } from "@/server/db/schema";
import { env } from "@/env";
import { formatRegistryId, registryIdRe, registryIdSql } from "@/server/registry-id";
import { commitImport } from "@/server/services/compounds";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});

describe("registry-ID format in SQL and TypeScript", () => {
  it("gives the same ID for the same number on both sides of the six-digit limit", async () => {
    const numbers = [1, 42, 999_999, 1_000_000, 12_345_678];
    const rows = await db.execute<{ n: number; id: string }>(
      sql`select n, ${registryIdSql(sql`n`)} as id from unnest(${`{${numbers.join(",")}}`}::int[]) as t(n) order by n`,
    );
    expect(rows.map((r) => [Number(r.n), r.id])).toEqual(numbers.map((n) => [n, formatRegistryId(n)]));
    expect(rows.map((r) => r.id)).toEqual([
      `${env.REGISTRY_PREFIX}000001`,
      `${env.REGISTRY_PREFIX}000042`,
      `${env.REGISTRY_PREFIX}999999`,
      `${env.REGISTRY_PREFIX}1000000`,
      `${env.REGISTRY_PREFIX}12345678`,
    ]);
    for (const r of rows) expect(registryIdRe.test(r.id)).toBe(true);
  });

  it("issues IDs in a committed import that the TypeScript rule gives for their registry numbers", async () => {
    const id = await importFile(
      w,
      "registry-ids.csv",
      `smiles,name\n${uniqueSmiles()},RID-1\n${uniqueSmiles()},RID-2\n`,
    );
    const result = await commitImport(w.people.admin, id, "all_or_nothing");
    expect(result.registered).toHaveLength(2);
    const ids = result.registered.map((r) => r.registryId);
    const rows = await db
      .select({ registryId: compounds.registryId, n: compounds.registryNumber })
      .from(compounds)
      .where(inArray(compounds.registryId, ids));
    expect(rows).toHaveLength(2);
    for (const r of rows) expect(r.registryId).toBe(formatRegistryId(r.n));
  });
});
