// What an import job stores of a hostile file's problems, measured in the real Postgres: a CSV with
// a 20 MB cell and thousands of records with several problems each keeps a bounded preview, says
// how many problems were not stored (view, report, commit result), and a file of 100,000 bad rows
// is failed with one short sentence. The rows and values are INVENTED; the caps are this
// product's own (caps.ts, upload-refusal.ts), so the limits checked are ours, not a reference's.
import { describe, it, expect, beforeAll } from "vitest";
import { sql } from "drizzle-orm";
import { callRoute, makeWorld, type World } from "@/test/harness";
import { compoundApi, type Json } from "@/test/compound-api";
import { db } from "@/server/db/client";
import * as reportRoute from "@/app/api/compound-imports/[importId]/report/route";
import { MAX_STORED_ISSUE_CHARS, MAX_STORED_ISSUES } from "./caps";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});
const { upload, commit } = compoundApi(() => w);

const MB20 = 20 * 1024 * 1024;
const HEADER = "smiles,name,purity_pct,amount,batch_date,stock_concentration_mm,stock_volume_ul,stock_date";
/** One record with a problem in every column but the name (INVENTED values). */
const badRow = (i: number) => `,BAD-${i} (invented),abc,-5,2024-13-45,xyz,-1,not-a-date`;

/** Bytes the job takes in Postgres: its row (preview and error as stored) and its staging rows. */
async function storedBytes(id: string) {
  const [r] = await db.execute<{ row: number; preview: number; error: number; staged: number }>(sql`
    select pg_column_size(i.*)::int as row,
           coalesce(octet_length(i.preview::text), 0)::int as preview,
           coalesce(octet_length(i.error), 0)::int as error,
           (select coalesce(sum(pg_column_size(r.*)), 0)::int from compound_import_rows r where r.import_id = i.id) as staged
    from compound_imports i where i.id = ${id}`);
  return r!;
}

describe("stored problems of an import are capped", () => {
  it("a 20 MB cell and 9,999 records with several problems each: a bounded preview that says what was cut", async () => {
    const lines = [`${HEADER},${"long header ".repeat(5000)}`, `${"C".repeat(MB20)},HUGE (invented),,,,,,,`];
    for (let i = 2; i <= 10_000; i++) lines.push(`${badRow(i)},`);
    const t0 = performance.now();
    const { id, view } = await upload("hostile-problems.csv", lines.join("\n"));
    const ms = performance.now() - t0;
    expect(view.status).toBe("ready");
    const p = view.preview as {
      totalRecords: number;
      invalid: number;
      issues: { record: number; field: string; message: string }[];
      issuesShown: number;
      issuesTotal: number;
      issuesNotStored: number;
      ignoredFields: string[];
    };
    expect(p.totalRecords).toBe(10_000);
    expect(p.invalid).toBe(10_000);
    expect(p.issues.length).toBeLessThanOrEqual(MAX_STORED_ISSUES);
    expect(p.issues[0]).toMatchObject({ record: 1, field: "smiles" });
    expect(p.issuesTotal).toBeGreaterThan(50_000);
    expect(p.issuesNotStored).toBe(p.issuesTotal - p.issues.length);
    for (const f of p.ignoredFields) expect(f.length).toBeLessThanOrEqual(200 + "… (truncated)".length);
    expect(p.ignoredFields[0]).toMatch(/… \(truncated\)$/);

    const bytes = await storedBytes(id);
    console.log(
      `[caps] ${(lines.join("\n").length / 1024 / 1024).toFixed(1)} MB file, ${p.issuesTotal} problems: stored ${p.issues.length}, preview ${bytes.preview} bytes as text, row ${bytes.row} bytes (TOAST-compressed), staged ${bytes.staged} bytes; upload to preview ${Math.round(ms)} ms`,
    );
    expect(bytes.preview).toBeLessThan(MAX_STORED_ISSUE_CHARS + 200_000);
    expect(bytes.staged).toBe(0);

    const report = await callRoute(reportRoute.GET, {
      user: w.people.chemist,
      path: `/api/compound-imports/${id}/report`,
      params: { importId: id },
    });
    expect(report.status).toBe(200);
    const csv = report.json as string;
    expect(csv.length).toBeLessThan(1_000_000);
    expect(csv.trimEnd().split("\r\n").at(-1)).toContain(
      `${p.issuesNotStored} more problems were found but not stored`,
    );

    const c = await commit(id, "valid_only");
    expect(c.status).toBe(200);
    const [after] = await db.execute<{ result: number }>(
      sql`select octet_length(result::text)::int as result from compound_imports where id = ${id}`,
    );
    expect(after!.result).toBeLessThan(MAX_STORED_ISSUE_CHARS + 200_000);
    expect(((c.json as Json).result as Json).notListed).toBe(p.issuesNotStored);
  }, 120_000);

  it("100,000 bad rows beside a 20 MB cell: a failed job with one short sentence", async () => {
    // Short rows (no structure, an invented name), so the file stays under the 25 MB upload limit.
    const lines = ["smiles,name", `${"C".repeat(MB20)},HUGE (invented)`];
    for (let i = 2; i <= 100_000; i++) lines.push(`,B-${i}`);
    const { id, view } = await upload("hostile-rows.csv", lines.join("\n"));
    expect(view.status).toBe("failed");
    expect(view.error).toMatch(/has 100,000 records; the limit is 10,000/);
    const bytes = await storedBytes(id);
    console.log(`[caps] 100,000 bad rows: error ${bytes.error} bytes, row ${bytes.row} bytes`);
    expect(bytes.error).toBeLessThan(2048 + 100);
    expect(bytes.row).toBeLessThan(4096);
  }, 120_000);
});
