// Set-up for the analysis pipeline's database tests: the invented demo plates written by the
// simulator from known parameters (src/lib/plates/demo-campaign.ts — invented data, not a
// reference) uploaded, QC'd and accepted in a fresh world whose assay has Km 20 µM and enzyme
// 10 nM, as the demo's.
import { expect } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns } from "@/server/db/schema";
import { demoCampaignPlates } from "@/lib/plates/demo-campaign";
import { parsePlateMapCsv } from "@/lib/plates";
import { createPlateMap, decideRun, uploadRun } from "@/server/services/plates";
import type { Campaign } from "@/server/services/campaigns";
import { makeWorld, type World } from "./harness";
import { ensureCompoundsRegistered } from "./compounds";

export const demo = demoCampaignPlates(20240601, { screenPlates: 0, compoundCount: 40 });

/** `got` within `tol` (relative) of `want`: 15 % is common practice for a replicated assay. */
export const within = (got: number | null | undefined, want: number, tol = 0.15) => {
  expect(got).not.toBeNull();
  expect(Math.abs(got! / want - 1)).toBeLessThanOrEqual(tol);
};

export type PlatesWorld = { w: World; campaign: Campaign; runIds: Record<string, string> };

export async function demoPlatesWorld(): Promise<PlatesWorld> {
  const w = await makeWorld();
  const [campaign] = await db
    .update(campaigns)
    .set({ kmValue: 20, kmUnit: "µM", enzymeConcValue: 10, enzymeConcUnit: "nM" })
    .where(eq(campaigns.id, w.campaignId))
    .returning();
  await ensureCompoundsRegistered(demo.compounds.map((c) => c.id));
  const runIds: Record<string, string> = {};
  for (const p of demo.plates) {
    const parsed = parsePlateMapCsv(p.mapCsv, p.format, `${p.name}.map.csv`);
    if (!parsed.ok) throw new Error(parsed.issues[0]!.text);
    const map = await createPlateMap(w.people.assay, w.campaignId, { name: p.name, map: parsed.map });
    const run = await uploadRun(w.people.assay, campaign!, {
      plateMapId: map.id,
      fileName: p.file.name,
      contentType: "text/csv",
      bytes: new TextEncoder().encode(p.file.contents),
    });
    expect(run.qc.verdict, `${p.name}: ${JSON.stringify(run.qc)}`).toBe("pass");
    await decideRun(w.people.assay, w.campaignId, run.id, "accepted", "QC passes");
    runIds[p.name] = run.id;
  }
  return { w, campaign: campaign!, runIds };
}

/** The run ids of the dose-response plates. */
export const doseResponseRuns = (runIds: Record<string, string>) =>
  Object.entries(runIds)
    .filter(([n]) => n.startsWith("dose-response"))
    .map(([, id]) => id);
