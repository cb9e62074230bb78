// "inadequate" as a label of its own on the hit grid's API item and in the weekly digest, against
// the real database. The results are INVENTED (src/test/hits.ts), not reference data; one mechanism
// call (INH-000005) is rewritten as an inadequate one, as the engine stores it for a partial inhibitor.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { and, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { compoundResults } from "@/server/db/schema";
import type { World } from "@/test/harness";
import { hitIds, hitsApi, hitsWorld } from "@/test/hits";
import { stopBoss } from "@/server/jobs/boss";
import { mechanismLabelNote } from "@/lib/hits/mechanism-label";
import type { HitItem } from "@/lib/hits/item";
import { gatherDigest, renderDigest } from "@/server/services/digest";
import { campaignById } from "@/server/services/digest/campaign";
import { refreshHitRows } from ".";

let w: World;
const { list, order } = hitsApi(() => w);
const FLAGS = ["inadequate-fit", "mechanism-inadequate", "partial-inhibition"];

beforeAll(async () => {
  ({ w } = await hitsWorld());
  await db
    .update(compoundResults)
    .set({ mechanismLabel: "inadequate", flags: FLAGS })
    .where(
      and(
        eq(compoundResults.campaignId, w.campaignId),
        eq(compoundResults.kind, "mechanism"),
        eq(compoundResults.compoundId, "INH-000005"),
      ),
    );
  await db.transaction((tx) => refreshHitRows(tx, w.campaignId, hitIds));
});
afterAll(() => stopBoss());

describe("an inadequate mechanism call", () => {
  it("the hits API item carries mechanismLabel 'inadequate' and the flags that say why; it ranks with the flagged rows", async () => {
    const r = await list("limit=100");
    expect(r.status).toBe(200);
    const items = (r.json as { items: HitItem[] }).items;
    const item = items.find((i) => i.registryId === "INH-000005")!;
    expect(item).toMatchObject({ mechanism: "mixed", mechanismLabel: "inadequate", flagged: true, ki: 0.5 });
    expect(item.flags).toEqual(expect.arrayContaining(FLAGS));
    expect(mechanismLabelNote(item.mechanismLabel, item.flags)!.why).toContain("partial inhibition");
    // Ranking rules unchanged: the clean rows first, then the flagged (list.int.test.ts has the full order).
    const ids = order(r.json);
    expect(ids.indexOf("INH-000005")).toBeGreaterThan(ids.indexOf("INH-000008"));
    expect(ids.slice(0, 2)).toEqual(["INH-000002", "INH-000012"]);
  });

  it("the weekly digest names it inadequate and says why, in the call list and the top ten", async () => {
    const d = await gatherDigest(await campaignById(w.campaignId), new Date());
    const call = d.mechanismCalls.find((m) => m.compoundId === "INH-000005")!;
    expect(call.label).toBe("inadequate");
    expect(call.note).toMatch(/^Mechanism inadequate: .*partial inhibition/);
    const top = d.topTen.find((t) => t.compoundId === "INH-000005")!;
    expect(top).toMatchObject({ inadequate: true, flagged: true });
    expect(d.topTen.find((t) => t.compoundId === "INH-000002")).toMatchObject({ inadequate: false, note: null });
    const { text } = await renderDigest(d, { id: w.people.lead.id, name: "Lead" });
    expect(text).toContain("mixed (inadequate), Ki");
    expect(text).toContain("(inadequate). Mechanism inadequate: the chosen standard model fails its adequacy checks");
  });
});
