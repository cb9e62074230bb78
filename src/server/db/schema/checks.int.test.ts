// The typed columns' check constraints against the real Postgres: each one lists exactly the
// values of the const array the TypeScript type is built from, and the database refuses anything
// else (SQLSTATE 23514, check_violation, PostgreSQL manual appendix A). Plate data are INVENTED.
import { describe, it, expect, beforeAll } from "vitest";
import { sql } from "drizzle-orm";
import { makeWorld, type World } from "@/test/harness";
import { registryIds, smallMap } from "@/test/plates";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { db } from "@/server/db/client";
import { createPlateMap } from "@/server/services/plates";
import { PLATE_FORMATS } from "@/lib/plates/geometry";
import { INHIBITION_MODELS } from "@/lib/kinetics/inhibition-models";
import { IMPORT_FORMATS } from "@/lib/chem/import-types";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
  await ensureCompoundsRegistered(registryIds(12));
});

const expected: Record<string, readonly (string | number)[]> = {
  plate_maps_format: PLATE_FORMATS,
  plate_runs_format: PLATE_FORMATS,
  compound_results_mechanism: INHIBITION_MODELS,
  mechanism_overrides_model: INHIBITION_MODELS,
  hit_rows_mechanism: INHIBITION_MODELS,
  compound_imports_format: IMPORT_FORMATS,
};

describe("typed columns", () => {
  it("each check constraint allows exactly the values of its const array", async () => {
    const rows = await db.execute<{ name: string; def: string }>(sql`
      select conname as name, pg_get_constraintdef(oid) as def from pg_constraint
      where contype = 'c' and conname::text in (${sql.join(
        Object.keys(expected).map((k) => sql`${k}`),
        sql`, `,
      )})`);
    expect(rows.map((r) => r.name).sort()).toEqual(Object.keys(expected).sort());
    for (const r of rows) {
      // Postgres writes `x in (…)` back as `x = ANY (ARRAY[…])`; the literals keep their order.
      const values = [...r.def.matchAll(/'([^']*)'|\b(\d+)\b/g)].map((m) => m[1] ?? Number(m[2]));
      expect(values, r.name).toEqual([...expected[r.name]!]);
    }
  });

  it("the database refuses a plate format outside PLATE_FORMATS", async () => {
    const { id } = await createPlateMap(w.people.assay, w.campaignId, { name: "Checked format", map: smallMap() });
    const e = await db.execute(sql`update plate_maps set format = 100 where id = ${id}`).catch((x: unknown) => x);
    const cause = (e as { cause?: { code?: string; constraint_name?: string } }).cause ?? e;
    expect((cause as { code?: string }).code).toBe("23514");
    expect((cause as { constraint_name?: string }).constraint_name).toBe("plate_maps_format");
  });
});
