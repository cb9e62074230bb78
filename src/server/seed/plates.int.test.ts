// The demo plates seed (INVENTED data) through the real services: every plate stored with its raw
// file and QC; the weak-window plate the demo generator builds on purpose fails QC (expected Z′ of
// its simulated assay below the campaign minimum — a consistency check, not a reference value).
import { describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { plateRuns } from "@/server/db/schema";
import { seedAccounts } from "./accounts";
import { seedPlates } from "./plates";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { registryIds } from "@/test/plates";

describe("demo plates seed", () => {
  it("stores every demo plate with QC and accepts the ones that pass", async () => {
    const t0 = Date.now();
    const ctx = await seedAccounts(db);
    await ensureCompoundsRegistered(registryIds(300)); // the compounds step of the real seed registers these
    const r = await seedPlates(db, ctx);
    const ms = Date.now() - t0;
    const runs = await db.select().from(plateRuns).where(eq(plateRuns.campaignId, ctx.mainCampaignId));
    expect(runs).toHaveLength(r.runs);
    expect(r.runs).toBeGreaterThanOrEqual(20);
    expect(runs.filter((x) => x.decision === "accepted").length).toBe(r.accepted);
    expect(runs.every((x) => (x.decision === "accepted") === (x.qcVerdict === "pass"))).toBe(true);
    const weak = runs.find((x) => x.fileName === "screen-07.csv")!;
    expect(weak.qcVerdict).toBe("fail");
    const edge = runs.find((x) => x.fileName === "screen-13.csv")!;
    expect(edge.qc.edge?.flagged).toBe(true);
    const mech = runs.find((x) => x.fileName === "mechanism-01.csv")!;
    expect(mech.readout).toBe("kinetic");
    expect(mech.reads).toBe(60);
    const [n] = await db.execute<{ n: number }>(
      sql`select count(*)::int as n from well_readings w join plate_runs r on r.id = w.run_id where r.campaign_id = ${ctx.mainCampaignId}`,
    );
    expect(n!.n).toBe(runs.reduce((s, x) => s + x.wellCount, 0));
    console.log(`[seed test] ${r.runs} plates in ${ms} ms`);
  });
});
