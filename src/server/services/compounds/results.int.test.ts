// A compound's results across campaigns against the real Postgres: only the campaigns a person is
// a member of (administrators see all). The compound, experiment and result are INVENTED.
import { describe, it, expect, beforeAll } from "vitest";
import crypto from "node:crypto";
import { makeWorld, type World } from "@/test/harness";
import { compoundApi } from "@/test/compound-api";
import { uniqueSmiles } from "@/test/compounds";
import { db } from "@/server/db/client";
import { analyses, compoundResults, experiments } from "@/server/db/schema";
import { resultsForCompound } from "@/server/services/compounds";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});
const { registerOrFind } = compoundApi(() => w);

describe("results across campaigns", () => {
  it("shows a compound's current results only in campaigns the person is a member of", async () => {
    const { registryId } = await registerOrFind(uniqueSmiles());
    const [e] = await db
      .insert(experiments)
      .values({ campaignId: w.campaignId, name: "Invented screen", kind: "single-dose" })
      .returning();
    const [a] = await db
      .insert(analyses)
      .values({
        experimentId: e!.id,
        campaignId: w.campaignId,
        status: "done",
        engineVersion: "test",
        inputHash: crypto.randomBytes(8).toString("hex"),
        inputs: { runs: [], masks: [], settings: {} } as never,
        isCurrent: true,
      })
      .returning();
    await db.insert(compoundResults).values({
      analysisId: a!.id,
      experimentId: e!.id,
      campaignId: w.campaignId,
      kind: "single-dose",
      compoundId: registryId,
      nPoints: 2,
      pctInhibition: 63.5,
      hit: true,
      // A single-dose result's detail: the 50 % rule at one tested concentration (invented).
      detail: { thresholdPct: 50, rule: { kind: "percent", thresholdPercent: 50 }, concentrationsUm: [10] },
    });
    const seen = await resultsForCompound({ id: w.people.viewer.id, globalRole: "member" }, registryId);
    expect(seen).toHaveLength(1);
    expect(seen[0]).toMatchObject({ experiment: "Invented screen", pctInhibition: 63.5, hit: true });
    expect(await resultsForCompound({ id: w.people.nonMember.id, globalRole: "member" }, registryId)).toHaveLength(0);
    expect(await resultsForCompound({ id: w.people.admin.id, globalRole: "admin" }, registryId)).toHaveLength(1);
  });
});
