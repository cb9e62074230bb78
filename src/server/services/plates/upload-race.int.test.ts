// Raw files of plate runs are shared by checksum: good and failing uploads of the same bytes,
// in two campaigns, raced with Promise.all and repeated,
// as CSV and as a file named .xlsx, must leave every committed run with its object in the S3 fake holding exactly its bytes.
// The plates are INVENTED data (src/test/plates.ts); the checksum is SHA-256 (FIPS 180-4, node:crypto).
import { beforeAll, describe, expect, it } from "vitest";
import crypto from "node:crypto";
import { inArray } from "drizzle-orm";
import { makeWorld, type World } from "@/test/harness";
import { campaignRow, registryIds, smallExport, smallMap } from "@/test/plates";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { db } from "@/server/db/client";
import { plateRuns } from "@/server/db/schema";
import { getObject } from "@/server/storage/s3";
import { plateMapFromWells, type PlateMapWell } from "@/lib/plates";
import { createPlateMap, uploadRun } from ".";

let w: World;
const maps: Record<string, string> = {};
beforeAll(async () => {
  w = await makeWorld();
  await ensureCompoundsRegistered(registryIds(12));
  const base = smallMap();
  const wells = [...base.wells.values()] as PlateMapWell[];
  // Refused for these exports: a sample well the export has no reading for.
  const missingWell = plateMapFromWells(96, [
    ...wells,
    { well: "D1", role: "sample", compound: registryIds(1)[0], concentrationUm: 10 },
  ]);
  const make = async (campaignId: string, name: string, map: ReturnType<typeof smallMap>) =>
    (await createPlateMap(w.people.admin, campaignId, { name, map })).id;
  maps.goodA = await make(w.campaignId, "Race good A", base);
  maps.goodB = await make(w.otherCampaignId, "Race good B", base);
  maps.missingB = await make(w.otherCampaignId, "Race missing well B", missingWell);
  maps.missingA = await make(w.campaignId, "Race missing well A", missingWell);
});

describe("good and failing uploads of the same bytes never cost a run its raw file", () => {
  it("10 rounds of 2 good and 3 failing concurrent uploads across campaigns and formats", async () => {
    const campaignA = await campaignRow(w.campaignId);
    const campaignB = await campaignRow(w.otherCampaignId);
    let good = 0;
    let failed = 0;
    for (let round = 0; round < 10; round++) {
      const bytes = smallExport(700_000 + round);
      const up = (campaign: typeof campaignA, plateMapId: string, name: string) =>
        uploadRun(w.people.admin, campaign, { plateMapId, fileName: name, contentType: "text/csv", bytes });
      const outcomes = await Promise.allSettled([
        up(campaignB, maps.missingB!, "fail-b.csv"),
        up(campaignA, maps.goodA!, "good-a.csv"),
        // The same bytes named as a workbook: refused as another file format.
        up(campaignA, maps.missingA!, "fail-a.xlsx"),
        up(campaignB, maps.goodB!, "good-b.csv"),
        up(campaignB, maps.missingB!, "fail-b-again.csv"),
      ]);
      // The two good ones commit (unless the other good one of the same campaign won: never here,
      // they are in different campaigns); the three failing ones are refused.
      const why = outcomes.map((o) => (o.status === "rejected" ? String((o.reason as Error).message) : "ok"));
      expect(why[1]).toBe("ok");
      expect(why[3]).toBe("ok");
      for (const i of [0, 2, 4]) expect(outcomes[i]!.status).toBe("rejected");
      good += 2;
      failed += 3;
    }
    const runs = await db
      .select({ id: plateRuns.id, sha256: plateRuns.sha256, s3Key: plateRuns.s3Key })
      .from(plateRuns)
      .where(inArray(plateRuns.campaignId, [w.campaignId, w.otherCampaignId]));
    expect(runs).toHaveLength(good);
    for (const r of runs) {
      const stored = await getObject(r.s3Key);
      expect(crypto.createHash("sha256").update(stored).digest("hex")).toBe(r.sha256);
    }
    expect(failed).toBe(30);
  });
});
