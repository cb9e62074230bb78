// Exporting the hit grid's view against the real database: the same rows as the API and the
// grid's datasource, and formula-looking text neutralised while numbers stay numbers. The results
// are INVENTED (src/test/hits.ts), not reference data.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import ExcelJS from "exceljs";
import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { memberships, users } from "@/server/db/schema";
import { callRoute, newTestUser, type World } from "@/test/harness";
import { hitsApi, hitsWorld } from "@/test/hits";
import { gridToQuery } from "@/lib/hits/grid-query";
import { hitQueryString } from "@/lib/hits/query";
import * as hitRoute from "@/app/api/campaigns/[campaignId]/hits/[registryId]/route";
import * as exportRoute from "@/app/api/campaigns/[campaignId]/hits/export/route";
import { stopBoss } from "@/server/jobs/boss";

let w: World;
const { base, list, order } = hitsApi(() => w);

beforeAll(async () => {
  ({ w } = await hitsWorld());
});
afterAll(() => stopBoss());

describe("one query everywhere", () => {
  it("gives the same rows from the API, the grid's datasource request and the CSV and XLSX exports", async () => {
    const handWritten = "sort=pctInhibition&dir=desc&mechanism=competitive,mixed,none&ic50Max=3";
    const fromGrid = hitQueryString(
      gridToQuery(
        [{ colId: "pctInhibition", sort: "desc" }],
        { ic50: { filterType: "number", type: "lessThanOrEqual", filter: 3 } },
        { mechanism: ["competitive", "mixed", "none"] },
      ),
      { limit: 100, offset: 0 },
    );
    const api = order((await list(`${handWritten}&limit=100`)).json);
    const grid = order((await list(fromGrid)).json);
    expect(api).toEqual(["INH-000012", "INH-000003", "INH-000001", "INH-000002", "INH-000009"]); // 99, 95, 92, 88, 40 % (invented table)
    expect(grid).toEqual(api);

    const csv = await callRoute(exportRoute.GET, {
      user: w.people.viewer,
      path: `${base()}/export?format=csv&${handWritten}`,
      params: { campaignId: w.campaignId },
    });
    expect(csv.status).toBe(200);
    const lines = (csv.json as string).trim().split("\r\n");
    expect(lines[0]).toContain("Ki (µM)");
    expect(lines[0]).toContain("IC50 (µM)");
    expect(lines[0]).toContain("MW (g/mol)");
    expect(lines[0]).toContain("LE (kcal/mol per heavy atom)");
    expect(lines.slice(1).map((l) => l.split(",")[0])).toEqual(api);

    const x = await callRoute(exportRoute.GET, {
      user: w.people.viewer,
      path: `${base()}/export?format=xlsx&${handWritten}`,
      params: { campaignId: w.campaignId },
    });
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(await x.response.arrayBuffer());
    const ws = wb.getWorksheet("Hits")!;
    const got: string[] = [];
    ws.eachRow((row, n) => void (n > 1 && got.push(String(row.getCell(1).value))));
    expect(got).toEqual(api);
  });
});

describe("export neutralises formula-looking text and keeps numbers as numbers", () => {
  it("in CSV and in XLSX (OWASP CSV injection guidance: prefix a single quote)", async () => {
    // An invented lead whose display name looks like a formula becomes the owner of INH-000008.
    const evil = await newTestUser("formula-name");
    await db.update(users).set({ name: '=HYPERLINK("http://x.invalid","a")' }).where(eq(users.id, evil.id));
    await db.insert(memberships).values({ campaignId: w.campaignId, userId: evil.id, role: "lead" });
    const p = await callRoute(hitRoute.PATCH, {
      user: evil,
      method: "PATCH",
      path: `${base()}/INH-000008`,
      params: { campaignId: w.campaignId, registryId: "INH-000008" },
      body: { status: "dropped", comment: "inactive (invented)" },
    });
    expect(p.status).toBe(200);

    const csv = await callRoute(exportRoute.GET, {
      user: w.people.lead,
      path: `${base()}/export?format=csv&q=INH-000008`,
      params: { campaignId: w.campaignId },
    });
    const [header, row] = (csv.json as string).trim().split("\r\n");
    const cols = header!.split(",");
    expect(row).toContain(`"'=HYPERLINK(""http://x.invalid"",""a"")"`);
    // −5 % stays a number, not text with a quote.
    const pctAt = cols.indexOf("Single-dose inhibition (%)");
    expect(pctAt).toBeGreaterThan(0);
    expect(row).toMatch(/,-5,/);

    const x = await callRoute(exportRoute.GET, {
      user: w.people.lead,
      path: `${base()}/export?format=xlsx&q=INH-000008`,
      params: { campaignId: w.campaignId },
    });
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(await x.response.arrayBuffer());
    const ws = wb.getWorksheet("Hits")!;
    const headers = (ws.getRow(1).values as unknown[]).slice(1).map(String);
    const cell = (name: string) => ws.getRow(2).getCell(headers.indexOf(name) + 1).value;
    expect(cell("Owner")).toBe('\'=HYPERLINK("http://x.invalid","a")');
    expect(cell("Single-dose inhibition (%)")).toBe(-5);
    expect(typeof cell("MW (g/mol)")).toBe("number");
  });
});
