/**
 * Upload parsing off the request thread: `npm run bench -- uploads`. For each hostile workbook of
 * the generated corpus (src/test/hostile-corpus.ts, INVENTED content) and for ordinary invented
 * exports, the time until the upload-parse pool answers, the largest event-loop lag of this
 * thread meanwhile (what every other request would wait), and this process's peak RSS. Before
 * the pool and the zip guard the 280 MB bomb took 28–30 s in the server thread and 3.5 GB.
 */
import { parseInWorker } from "../src/server/workers/upload-parse-pool";
import { hostileCorpus } from "../src/test/hostile-corpus";
import { writeGridXlsx, writeLongKinetic } from "../src/lib/plates/export-writers";
import { allWells } from "../src/lib/plates/geometry";
import { parseReaderExport } from "../src/lib/plates/reader-export";

async function measure(label: string, bytes: Uint8Array, name: string): Promise<void> {
  let maxLag = 0;
  let last = performance.now();
  const timer = setInterval(() => {
    const now = performance.now();
    maxLag = Math.max(maxLag, now - last - 10);
    last = now;
  }, 10);
  let peak = process.memoryUsage.rss();
  const mem = setInterval(() => (peak = Math.max(peak, process.memoryUsage.rss())), 50);
  const t0 = performance.now();
  let outcome: string;
  try {
    const r = await parseInWorker({ kind: "plate-export", bytes, fileName: name, options: {} }, name);
    outcome = r.ok ? `parsed, ${r.export.wells.size} wells × ${r.export.reads} reads` : r.issues[0]!.message;
  } catch (e) {
    outcome = (e as Error).message;
  }
  const ms = performance.now() - t0;
  clearInterval(timer);
  clearInterval(mem);
  console.log(
    `${label.padEnd(34)} ${(bytes.byteLength / 1024).toFixed(0).padStart(7)} KB  ${ms.toFixed(0).padStart(6)} ms  lag ≤ ${maxLag.toFixed(0).padStart(4)} ms  rss ${(peak / 1024 / 1024).toFixed(0).padStart(5)} MB  ${outcome.slice(0, 90)}`,
  );
}

const corpus = await hostileCorpus();
const pick = (n: string) => corpus.find((f) => f.name === n)!;
// Warm the pool once (a cold worker loads tsx and exceljs: reported separately).
const t = performance.now();
await parseInWorker(
  { kind: "plate-export", bytes: new TextEncoder().encode("well,value\nA1,1\n"), fileName: "w.csv", options: {} },
  "w.csv",
);
console.log(`cold start of a parse worker: ${(performance.now() - t).toFixed(0)} ms`);
for (const n of [
  "bomb-280mb-declared.xlsx",
  "bomb-280mb-underdeclared.xlsx",
  "bomb-1gb-underdeclared.xlsx",
  "bomb-sheet-whitespace.xlsx",
  "rows-800k.xlsx",
  "columns-1e6.xlsx",
  "shared-strings-many.xlsx",
  "shared-string-40mb.xlsx",
  "deep-xml.xlsx",
  "header-24mb.csv",
  "many-rows.csv",
])
  await measure(n, pick(n).bytes, n);

// Ordinary invented exports: what the worker costs against parsing in this thread.
const wells = allWells(384);
const timesS = Array.from({ length: 60 }, (_, k) => k * 10);
const kinetic = new TextEncoder().encode(
  writeLongKinetic(timesS, new Map(wells.map((w, i) => [w, timesS.map((s) => 200 + (i % 7) + 0.8 * s)]))),
);
const grid = await writeGridXlsx(384, [{ values: new Map(wells.map((w, i) => [w, 5000 + (i % 13)])) }]);
for (const [label, bytes, name] of [
  ["384-well long kinetic CSV, 60 reads", kinetic, "k.csv"],
  ["384-well grid XLSX", grid, "g.xlsx"],
] as const) {
  await measure(`${label} (pool)`, bytes, name);
  const t0 = performance.now();
  await parseReaderExport(bytes, name);
  console.log(`${label} (in this thread): ${(performance.now() - t0).toFixed(0)} ms`);
}
process.exit(0);
