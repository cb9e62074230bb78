/**
 * Server time of a plate upload (not a test): `npm run bench -- plates-server`, which provides
 * DATABASE_URL and the S3 fake. Each case calls the upload service as the route handler does:
 * size cap, SHA-256, duplicate check, PutObject to the object store, parse with the plate map's
 * format, check against the map, initial rates (kinetic), QC and % inhibition, and one
 * transaction writing the run and its readings. Goals: a 1536-well endpoint export
 * < 300 ms; a 384-well kinetic export with 60 reads < 500 ms. Every file differs by one note line
 * so no upload is a duplicate. The plates are INVENTED (random values around two control levels).
 */
import crypto from "node:crypto";
import { db, sqlClient } from "@/server/db/client";
import { campaigns, plateMaps, users } from "@/server/db/schema";
import { uploadRun } from "@/server/services/plates";
import { formatRegistryId } from "@/server/registry-id";
import { withControls } from "@/lib/plates/layouts";
import { writeGridText, writeLongKinetic } from "@/lib/plates/export-writers";
import { parseReaderExport } from "@/lib/plates/reader-export";
import { seededNormal } from "@/lib/plates/simulate";
import type { PlateFormat } from "@/lib/plates/geometry";
import type { PlateMapWell } from "@/lib/plates/plate-map";

const z = seededNormal(7);

function fullMap(format: PlateFormat): PlateMapWell[] {
  return withControls(format).wells.map((w, i) =>
    w.role === "empty"
      ? {
          well: w.well,
          role: "sample" as const,
          compound: formatRegistryId((i % 900) + 1),
          concentrationUm: 10,
        }
      : w,
  );
}

function endpointValues(map: PlateMapWell[]): Map<string, number> {
  return new Map(map.map((w) => [w.well, Math.round((w.role === "full" ? 1500 : 12000) * (1 + 0.03 * z()))]));
}

function kineticFile(map: PlateMapWell[], reads: number): { timesS: number[]; wells: Map<string, number[]> } {
  const timesS = Array.from({ length: reads }, (_, k) => k * 10);
  const wells = new Map(
    map.map((w) => [w.well, timesS.map((t) => Number((200 + (w.role === "full" ? 0 : 0.8) * t + 3 * z()).toFixed(1)))]),
  );
  return { timesS, wells };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const p90 = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(xs.length * 0.9))]!;

async function main(): Promise<void> {
  const userId = crypto.randomUUID();
  await db
    .insert(users)
    .values({ id: userId, email: `bench-${userId}@bench.invalid`, name: "Bench (invented)", globalRole: "admin" });
  const [campaign] = await db
    .insert(campaigns)
    .values({ name: "Bench campaign (invented)", targetEnzyme: "Bench enzyme (invented)" })
    .returning();
  const actor = { id: userId, email: `bench-${userId}@bench.invalid` };
  const rows: string[] = [];

  async function bench(label: string, format: PlateFormat, make: (k: number) => string, runs: number, goalMs: number) {
    const map = fullMap(format);
    const [m] = await db
      .insert(plateMaps)
      .values({
        campaignId: campaign!.id,
        name: `${label} map`,
        format,
        wells: map,
        sampleWells: map.filter((w) => w.role === "sample").length,
        neutralWells: 0,
        fullWells: 0,
        createdBy: userId,
      })
      .returning();
    const enc = new TextEncoder();
    const ms: number[] = [];
    const parseMs: number[] = [];
    let size = 0;
    for (let k = 0; k < runs + 3; k++) {
      const bytes = enc.encode(make(k));
      size = bytes.byteLength;
      const t0 = performance.now();
      const r = await uploadRun(actor, campaign!, {
        plateMapId: m!.id,
        fileName: `${label}-${k}.csv`,
        contentType: "text/csv",
        bytes,
      });
      const dt = performance.now() - t0;
      if (r.qc.verdict !== "pass") throw new Error(`${label}: QC ${r.qc.verdict}`);
      const p0 = performance.now();
      await parseReaderExport(bytes, "x.csv", { format });
      const dp = performance.now() - p0;
      if (k >= 3) {
        ms.push(dt);
        parseMs.push(dp);
      }
    }
    const med = median(ms);
    rows.push(
      `| ${label} | ${(size / 1024).toFixed(0)} KB | ${runs} | ${med.toFixed(0)} ms | ${p90(ms).toFixed(0)} ms | ${median(parseMs).toFixed(0)} ms | < ${goalMs} ms | ${med < goalMs ? "met" : "NOT met"} |`,
    );
  }

  const m1536 = fullMap(1536);
  await bench(
    "1536-well endpoint, CSV grid",
    1536,
    (k) => writeGridText(1536, [{ values: endpointValues(m1536) }], { notes: [`Invented bench plate ${k}`] }),
    15,
    300,
  );
  const m384 = fullMap(384);
  const kin = kineticFile(m384, 60);
  await bench(
    "384-well kinetic, 60 reads, CSV grids",
    384,
    (k) =>
      writeGridText(
        384,
        kin.timesS.map((timeS, i) => ({ timeS, values: new Map([...kin.wells].map(([w, s]) => [w, s[i]!])) })),
        { notes: [`Invented bench plate ${k}`] },
      ),
    15,
    500,
  );
  await bench(
    "384-well kinetic, 60 reads, CSV long",
    384,
    (k) => writeLongKinetic(kin.timesS, kin.wells, { notes: [`Invented bench plate ${k}`] }),
    15,
    500,
  );

  console.log(
    `node ${process.version}; upload service end to end (hash, S3 fake, parse, map check, rates, QC, % inhibition, one transaction)\n`,
  );
  console.log("| case | file | runs | median | p90 | of which parse (median) | goal | |");
  console.log("|---|---|---|---|---|---|---|---|");
  for (const r of rows) console.log(r);
}

main()
  .catch((e: unknown) => {
    console.error(e);
    process.exitCode = 1;
  })
  .finally(() => sqlClient.end());
