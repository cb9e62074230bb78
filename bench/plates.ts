/**
 * Parse timings of the plate library: `npx tsx bench/plates.ts`. Files are simulated (invented)
 * in memory; each case is parsed 3 times to warm up, then timed over 20 runs (median and max).
 */
import { writeGridText, writeGridXlsx, writeLongEndpoint, writeLongKinetic } from "../src/lib/plates/export-writers";
import { allWells, type PlateFormat } from "../src/lib/plates/geometry";
import { parseReaderExport } from "../src/lib/plates/reader-export";
import { seededNormal } from "../src/lib/plates/simulate";

const enc = new TextEncoder();
const z = seededNormal(1);

function endpointValues(format: PlateFormat): Map<string, number> {
  return new Map(allWells(format).map((w) => [w, Math.round(5000 + 500 * z())]));
}

function kineticSeries(format: PlateFormat, reads: number): { timesS: number[]; wells: Map<string, number[]> } {
  const timesS = Array.from({ length: reads }, (_, k) => k * 10);
  const wells = new Map(
    allWells(format).map((w) => [w, timesS.map((t) => Number((200 + 0.8 * t + 3 * z()).toFixed(1)))]),
  );
  return { timesS, wells };
}

async function time(label: string, bytes: Uint8Array, name: string, runs = 20): Promise<void> {
  for (let i = 0; i < 3; i++) {
    const r = await parseReaderExport(bytes, name);
    if (!r.ok) throw new Error(`${label}: ${r.issues[0]?.text}`);
  }
  const ms: number[] = [];
  let summary = "";
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    const r = await parseReaderExport(bytes, name);
    ms.push(performance.now() - t0);
    if (r.ok) summary = `${r.export.shape}, ${r.export.wells.size} wells × ${r.export.reads} reads`;
  }
  ms.sort((a, b) => a - b);
  const median = ms[Math.floor(ms.length / 2)]!;
  console.log(
    `${label.padEnd(38)} ${(bytes.length / 1024).toFixed(0).padStart(6)} KB  median ${median.toFixed(1).padStart(6)} ms  max ${ms[ms.length - 1]!.toFixed(1).padStart(6)} ms  (${summary})`,
  );
}

async function main(): Promise<void> {
  console.log(`node ${process.version}; parse only (no storage, QC or normalisation)`);
  const e1536 = endpointValues(1536);
  await time("1536-well endpoint, CSV grid", enc.encode(writeGridText(1536, [{ values: e1536 }])), "e.csv");
  await time("1536-well endpoint, CSV long", enc.encode(writeLongEndpoint(e1536)), "e.csv");
  await time("1536-well endpoint, XLSX grid", await writeGridXlsx(1536, [{ values: e1536 }]), "e.xlsx", 10);
  const k = kineticSeries(384, 60);
  const reads = k.timesS.map((timeS, i) => ({ timeS, values: new Map([...k.wells].map(([w, s]) => [w, s[i]!])) }));
  await time("384-well × 60 reads, CSV grids", enc.encode(writeGridText(384, reads)), "k.csv");
  await time("384-well × 60 reads, TSV grids", enc.encode(writeGridText(384, reads, { delimiter: "\t" })), "k.tsv");
  await time("384-well × 60 reads, CSV long", enc.encode(writeLongKinetic(k.timesS, k.wells)), "k.csv");
  await time("384-well × 60 reads, XLSX grids", await writeGridXlsx(384, reads), "k.xlsx", 10);
  const big = kineticSeries(1536, 500);
  await time(
    "1536-well × 500 reads, CSV long (limit)",
    enc.encode(writeLongKinetic(big.timesS, big.wells)),
    "big.csv",
    5,
  );
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
