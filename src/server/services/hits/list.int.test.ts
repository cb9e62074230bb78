// Reading the hit grid against the real database: one ranked order, server-side sort and filter,
// and the same items from the API's page query as from the export's. The results are INVENTED
// (src/test/hits.ts), not reference data.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { and, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { hitRows } from "@/server/db/schema";
import type { World } from "@/test/harness";
import { hitsApi, hitsWorld } from "@/test/hits";
import { hitListSchema } from "@/lib/hits/query";
import { stopBoss } from "@/server/jobs/boss";
import { exportHits, listHits, refreshHitRows } from ".";

let w: World;
const { list, order } = hitsApi(() => w);

beforeAll(async () => {
  ({ w } = await hitsWorld());
});
afterAll(() => stopBoss());

describe("hit rows", () => {
  it("rank clean rows by Ki, then IC50, then % inhibition (descending), with flagged or ambiguous rows after them", async () => {
    const r = await list("limit=100");
    expect(r.status).toBe(200);
    // Expected order worked out by hand from the invented table above (common practice for ranking: Ki first).
    expect(order(r.json)).toEqual([
      "INH-000002", // Ki 0.01
      "INH-000012", // Ki 0.2
      "INH-000005", // Ki 0.5
      "INH-000001", // IC50 0.5
      "INH-000009", // IC50 2
      "INH-000004", // 71 %
      "INH-000010", // 65 %
      "INH-000011", // 12 %
      "INH-000008", // −5 %
      "INH-000007", // flagged: Ki 0.02
      "INH-000006", // ambiguous: Ki 0.05
      "INH-000003", // flagged: IC50 0.1
    ]);
    expect((r.json as { total: number }).total).toBe(12);
  });

  it("sort and filter on the server, and say what is wrong with a bad query", async () => {
    const r = await list("sort=ic50&dir=desc&ic50Max=1&limit=3&offset=1");
    expect(order(r.json)).toEqual(["INH-000001", "INH-000007", "INH-000003"]);
    expect((r.json as { total: number }).total).toBe(6);
    const bad = await list("sort=potency");
    expect(bad.status).toBe(400);
    expect((bad.json as { error: string }).error).toMatch(/sort must be one of/);
    const badNum = await list("kiMin=abc");
    expect(badNum.status).toBe(400);
    expect((badNum.json as { error: string }).error).toMatch(/kiMin must be a number/);
  });
});

describe("one query everywhere", () => {
  it("gives the API's items (JSON built in Postgres) exactly as the export's objects", async () => {
    const f = hitListSchema.parse({ sort: "lipe", dir: "desc" });
    const page = await listHits(w.campaignId, f, 100, 0);
    const all = await exportHits(w.campaignId, f);
    expect(page.items).toEqual(all.items);
    expect(page.items.some((i) => i.lastTested !== null && i.ki !== null)).toBe(true);
  });

  it("keeps each row's stored API item in step with the row, whatever writes it (the trigger)", async () => {
    // A write that does not go through refreshHitRows: the trigger still rewrites the stored item.
    await db
      .update(hitRows)
      .set({ ownerName: "Direct Writer (invented)", commentCount: 41 })
      .where(and(eq(hitRows.campaignId, w.campaignId), eq(hitRows.compoundId, "INH-000011")));
    const f = hitListSchema.parse({ sort: "registryId", dir: "asc" });
    const page = await listHits(w.campaignId, f, 100, 0);
    const all = await exportHits(w.campaignId, f);
    const item = page.items.find((i) => i.registryId === "INH-000011")!;
    expect(item.owner).toBe("Direct Writer (invented)");
    expect(item.comments).toBe(41);
    expect(page.items).toEqual(all.items);
    await db.transaction((tx) => refreshHitRows(tx, w.campaignId, ["INH-000011"])); // back to what the data says
    const again = (await listHits(w.campaignId, f, 100, 0)).items.find((i) => i.registryId === "INH-000011")!;
    expect(again.comments).not.toBe(41);
  });
});
