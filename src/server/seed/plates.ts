import "server-only";
import type { Db } from "@/server/db/client";
import { eq, inArray } from "drizzle-orm";
import { campaigns, compounds, plateRuns, users } from "@/server/db/schema";
import { demoCampaignPlates } from "@/lib/plates/demo-campaign";
import { createPlateMap, decideRun, uploadRun } from "@/server/services/plates";

/** Seed of the invented demo campaign's plates (the same seed every time). */
export const DEMO_PLATES_SEED = 20240611;

/**
 * INVENTED demo plates for the main demo campaign: about 20 single-dose 384-well plates, three
 * dose-response plates and a kinetic mechanism plate, each stored through the same service as a
 * real upload (raw file in the object store, checksum, QC), uploaded by the demo assay scientist.
 * Runs that pass QC are accepted; the ones that fail stay for review. Upload times are spread
 * over the past weeks (invented) so the Z′ trend has a shape.
 */
export async function seedPlates(
  db: Db,
  ctx: { mainCampaignId: string; userIds: Record<string, string> },
): Promise<{ runs: number; accepted: number }> {
  const assayId = ctx.userIds["assay@example.org"];
  if (!assayId) throw new Error("seedPlates: the demo assay scientist is missing");
  const [assay] = await db.select({ id: users.id, email: users.email }).from(users).where(eq(users.id, assayId));
  const [campaign] = await db.select().from(campaigns).where(eq(campaigns.id, ctx.mainCampaignId));
  const demo = demoCampaignPlates(DEMO_PLATES_SEED);
  // Plate maps name registered compounds only: the compounds step of the seed runs first.
  const ids = demo.compounds.map((c) => c.id);
  const registered = await db
    .select({ id: compounds.registryId })
    .from(compounds)
    .where(inArray(compounds.registryId, ids));
  if (registered.length < ids.length) {
    console.warn(
      `[seed] demo plates skipped: ${ids.length - registered.length} of the ${ids.length} demo compounds are not registered (the compounds step loads them).`,
    );
    return { runs: 0, accepted: 0 };
  }
  const now = Date.now();
  const day = 24 * 3600 * 1000;
  let accepted = 0;
  let k = 0;
  for (const p of demo.plates) {
    const { id: mapId } = await createPlateMap(assay!, campaign!.id, {
      name: `${p.name} (${p.experiment})`,
      map: p.map,
      isTemplate: p.name === "screen-01",
    });
    const bytes = new TextEncoder().encode(p.file.contents);
    const run = await uploadRun(assay!, campaign!, {
      plateMapId: mapId,
      fileName: p.file.name,
      contentType: "text/csv",
      bytes,
      barcode: `DEMO-${String(k + 1).padStart(4, "0")}`,
    });
    // Invented upload times: one plate every ~1.2 days up to yesterday.
    const at = new Date(now - (demo.plates.length - k) * 1.2 * day);
    await db.update(plateRuns).set({ uploadedAt: at }).where(eq(plateRuns.id, run.id));
    if (run.qc.verdict === "pass") {
      await decideRun(
        assay!,
        campaign!.id,
        run.id,
        "accepted",
        "Demo: QC within the campaign's limits (invented data).",
      );
      accepted += 1;
    }
    k += 1;
  }
  return { runs: demo.plates.length, accepted };
}
