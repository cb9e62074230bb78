// The compound panel's data against the real database: the row, its current results and their
// stored details, each of which the panel reads through the result-detail schema
// (src/lib/analysis/detail.ts). The invented results are those of src/test/hits.ts; the
// single-dose result of src/test/analyses.ts is computed by the analysis pipeline.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { makeWorld, type World } from "@/test/harness";
import { analysesWorld } from "@/test/analyses";
import { hitsWorld } from "@/test/hits";
import { parseResultDetail } from "@/lib/analysis/detail";
import { stopBoss } from "@/server/jobs/boss";
import { hitDetail } from ".";

let w: World;

beforeAll(async () => {
  ({ w } = await hitsWorld());
});
afterAll(() => stopBoss());

describe("the compound panel", () => {
  it("gives the row and every current result with a detail its schema reads", async () => {
    const d = await hitDetail(w.campaignId, "INH-000002");
    expect(d.row.registryId).toBe("INH-000002");
    expect(d.results.map((r) => r.kind).sort()).toEqual(["dose-response", "mechanism", "single-dose"]);
    for (const r of d.results) expect(() => parseResultDetail(r.kind, r.detail)).not.toThrow();

    const w2 = await makeWorld();
    await analysesWorld(w2);
    const computed = await hitDetail(w2.campaignId, "INH-000001");
    expect(computed.results).toHaveLength(1);
    const sd = parseResultDetail("single-dose", computed.results[0]!.detail);
    expect(sd.concentrationsUm.length).toBeGreaterThan(0);
  });

  it("says which compound has no result in the campaign", async () => {
    await expect(hitDetail(w.campaignId, "INH-999999")).rejects.toThrow("No result in this campaign for INH-999999.");
  });
});
