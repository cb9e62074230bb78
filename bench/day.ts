/**
 * A screening day (benchmark, not a test): `npm run bench -- day`, which provides DATABASE_URL and
 * the S3 fake. 40 INVENTED 384-well dose-response plate exports (16 compounds per plate, 10
 * concentrations in 3-fold steps from 30 µM, duplicate rows, neutral and full-inhibition controls
 * on every plate, values from a four-parameter logistic with invented IC50s and 3 % noise) in one
 * zip, through the services the routes call: batch upload (unzip behind the zip checks, SHA-256,
 * object store, match by file name, parse each file in the worker pool, QC, one transaction per
 * run) → accept all that pass → a dose-response analysis of the accepted runs, computed here
 * (the worker's code path) → the first page of the refreshed hit grid. Each stage's time is
 * printed; goal: upload to results in the grid < 60 s on this 2-core machine.
 */
import crypto from "node:crypto";
import JSZip from "jszip";
import { db, sqlClient } from "@/server/db/client";
import { campaigns, memberships, plateMaps, users } from "@/server/db/schema";
import { acceptPassing, createBatch, getBatch } from "@/server/services/plates/batches";
import { analyseNow, createExperiment } from "@/server/services/analyses";
import { listHitsJson } from "@/server/services/hits";
import { hitFilterSchema } from "@/lib/hits/query";
import { doseResponseLayout } from "@/lib/plates/layouts";
import { writeGridText } from "@/lib/plates/export-writers";
import { fourParameterLogistic, seededNormal } from "@/lib/plates/simulate";
import { registryIds } from "@/test/plates";
import { ensureCompoundsRegistered } from "@/test/compounds";

const PLATES = 40;
const PER_PLATE = 16;
const COMPOUNDS = 300;
const noise = seededNormal(16);
const s = (t0: number) => ((performance.now() - t0) / 1000).toFixed(1);

async function main(): Promise<void> {
  const ids = registryIds(COMPOUNDS);
  await ensureCompoundsRegistered(ids);
  const userId = crypto.randomUUID();
  const email = `bench-day-${userId}@bench.invalid`;
  await db.insert(users).values({ id: userId, email, name: "Bench (invented)", globalRole: "admin" });
  const [campaign] = await db
    .insert(campaigns)
    .values({ name: "Bench screening day (invented)", targetEnzyme: "Benchase (invented)" })
    .returning();
  await db.insert(memberships).values({ campaignId: campaign!.id, userId, role: "lead" });
  const actor = { id: userId, email };
  const ic50 = new Map(ids.map((id, i) => [id, 0.05 * 1.03 ** i])); // invented, 0.05–350 µM

  const zip = new JSZip();
  for (let p = 0; p < PLATES; p++) {
    const series = Array.from({ length: PER_PLATE }, (_, k) => ({
      compound: ids[(p * PER_PLATE + k) % COMPOUNDS]!,
      topConcentrationUm: 30,
    }));
    const map = doseResponseLayout(384, series, { points: 10, dilutionFactor: 3, replicates: 2 });
    const name = `DAY-${String(p + 1).padStart(2, "0")}`;
    await db.insert(plateMaps).values({
      campaignId: campaign!.id,
      name,
      format: 384,
      wells: [...map.wells],
      sampleWells: map.wells.filter((w) => w.role === "sample").length,
      neutralWells: map.wells.filter((w) => w.role === "neutral").length,
      fullWells: map.wells.filter((w) => w.role === "full").length,
      createdBy: userId,
    });
    const values = new Map<string, number>();
    for (const w of map.wells) {
      const activityPct =
        w.role === "neutral"
          ? 100
          : w.role === "full"
            ? 0
            : w.role === "sample"
              ? fourParameterLogistic(w.concentrationUm!, {
                  top: 100,
                  bottom: 0,
                  ic50: ic50.get(w.compound!)!,
                  hill: 1,
                })
              : null;
      if (activityPct === null) continue;
      values.set(w.well, Math.round((1500 + 105 * activityPct) * (1 + 0.03 * noise())));
    }
    zip.file(`${name}_plate.csv`, writeGridText(384, [{ values }], { notes: [`Invented bench plate ${name}`] }));
  }
  const zipBytes = await zip.generateAsync({ type: "uint8array", compression: "DEFLATE" });

  const t0 = performance.now();
  const { id: batchId } = await createBatch(
    actor,
    campaign!,
    { files: [{ name: "day.zip", contentType: "application/zip", bytes: zipBytes }] },
    { wait: true },
  );
  const tUpload = s(t0);
  const batch = await getBatch(campaign!.id, batchId);
  const t1 = performance.now();
  const accepted = await acceptPassing(actor, campaign!, batchId, "Bench: controls within limits (invented)");
  const tAccept = s(t1);
  const t2 = performance.now();
  const { id: experimentId } = await createExperiment(actor, campaign!, {
    name: "Bench day dose-response (invented)",
    kind: "dose-response",
    runIds: accepted.accepted,
  });
  await analyseNow(actor, campaign!, experimentId);
  const tAnalysis = s(t2);
  const t3 = performance.now();
  const page = await listHitsJson(campaign!.id, hitFilterSchema.parse({}), 100, 0);
  const tGrid = s(t3);
  const total = ((performance.now() - t0) / 1000).toFixed(1);
  console.log(
    `${PLATES} invented 384-well dose-response plates in one zip (${(zipBytes.byteLength / 1024).toFixed(0)} KB); ${batch.counts.stored} stored, ${batch.counts.pass} pass QC; ${accepted.accepted.length} accepted; ${page.total} compounds in the hit grid\n`,
  );
  console.log("| stage | time |");
  console.log("|---|---|");
  console.log(`| batch upload (unzip, checksums, store, parse, QC, write) | ${tUpload} s |`);
  console.log(`| accept all that pass | ${tAccept} s |`);
  console.log(`| dose-response analysis (create experiment, compute, hit refresh) | ${tAnalysis} s |`);
  console.log(`| first page of the hit grid (100 rows) | ${tGrid} s |`);
  console.log(
    `| total, upload to results in the grid | ${total} s (goal < 60 s: ${Number(total) < 60 ? "met" : "NOT met"}) |`,
  );
}

main()
  .catch((e: unknown) => {
    console.error(e);
    process.exitCode = 1;
  })
  .finally(() => sqlClient.end());
