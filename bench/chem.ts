/**
 * Chemistry benchmark (not a test): `npx tsx bench/chem.ts [records] [candidates]`.
 *
 * 1. Bulk import of N SMILES records (default 10,000): CSV parse + form checks, then structure
 *    parse + properties + fingerprint + in-file duplicate check (import-prepare.ts). The database
 *    part of the import is not measured here.
 * 2. Substructure search over the prepared molecules: the in-memory fingerprint prefilter (what
 *    Postgres does with `(fp & q) = q`) and the exact openchemlib check on every candidate, from
 *    stored ID codes, for 20 fragments; prints the median. Then the same 20 fragments over
 *    100,000 rows (the set repeated), asking only for the first page of 50 (exactSearchPage).
 * 3. For comparison, openchemlib's own SSSearcherWithIndex index on 200 molecules (why it is not
 *    used for storage).
 *
 * The molecules are INVENTED: random chains of drug-like units built by a seeded generator, only
 * for timing.
 */
import os from "node:os";
import { SSSearcherWithIndex } from "openchemlib";
import { fingerprintContains, fromBitString } from "@/lib/chem/fingerprint";
import { prepareImport } from "@/lib/chem/import-prepare";
import { parseCsvImport } from "@/lib/chem/import-table";
import { parseSmiles } from "@/lib/chem/parse";
import { createSubstructureMatcher, exactSearchPage, parseFragmentQuery } from "@/lib/chem/substructure";
import { structureSvg } from "@/lib/chem/svg";
import { SEARCH_FRAGMENTS, inventedSmiles, median } from "./_compound-data";

const N = Number(process.argv[2] ?? 10_000);

function ms(t0: number): number {
  return performance.now() - t0;
}

/** CPU time of this process (user + system), less sensitive than wall time to other load on the machine. */
function cpuMs(since: NodeJS.CpuUsage): number {
  const d = process.cpuUsage(since);
  return (d.user + d.system) / 1000;
}

const smiles = inventedSmiles(N);
const csv = [
  "smiles,name,supplier,purity_pct,amount_mg",
  ...smiles.map((s, i) => `${s},BENCH-${i + 1},Invented Supplier,98.5,10`),
].join("\n");

// Warm up openchemlib (first calls compile and initialise).
prepareImport(parseCsvImport(csv.split("\n").slice(0, 51).join("\n")).records);

let t0 = performance.now();
let c0 = process.cpuUsage();
const parsed = parseCsvImport(csv);
const tCsv = ms(t0);
const cCsv = cpuMs(c0);
t0 = performance.now();
c0 = process.cpuUsage();
const prep = prepareImport(parsed.records);
const tPrep = ms(t0);
const cPrep = cpuMs(c0);
const duplicates = prep.issues.filter((i) => i.message.startsWith("Same structure")).length;
console.log(
  `import of ${N.toLocaleString("en")} SMILES records (wall / CPU of this process; os.loadavg ${os.loadavg()[0]?.toFixed(1)})`,
);
console.log(`  CSV parse + form checks:                     ${tCsv.toFixed(0)} / ${cCsv.toFixed(0)} ms`);
console.log(
  `  structure + properties + fingerprint + dups: ${tPrep.toFixed(0)} / ${cPrep.toFixed(0)} ms (${(tPrep / N).toFixed(2)} / ${(cPrep / N).toFixed(2)} ms per record)`,
);
console.log(
  `  total:                                       ${((tCsv + tPrep) / 1000).toFixed(1)} / ${((cCsv + cPrep) / 1000).toFixed(1)} s`,
);
console.log(
  `  prepared ${prep.prepared.length}; in-file duplicates ${duplicates}; unreadable ${prep.issues.length - duplicates}`,
);

const stored = prep.prepared.map((p) => ({ key: p.properties.structureKey, fp: fromBitString(p.fingerprintBits) }));
const times: number[] = [];
console.log(
  `\nsubstructure search over ${stored.length.toLocaleString("en")} molecules (prefilter in memory + exact check from ID codes)`,
);
for (const text of SEARCH_FRAGMENTS) {
  const q = parseFragmentQuery(text);
  if (!q.ok) throw new Error(q.error);
  t0 = performance.now();
  const match = createSubstructureMatcher(q);
  let candidates = 0;
  let hits = 0;
  for (const m of stored) {
    if (!fingerprintContains(m.fp, q.fingerprint)) continue;
    candidates++;
    if (match(m.key)) hits++;
  }
  const t = ms(t0);
  times.push(t);
  console.log(
    `  ${text.padEnd(22)} candidates ${String(candidates).padStart(6)}  hits ${String(hits).padStart(6)}  ${t.toFixed(0)} ms`,
  );
}
console.log(`  median over ${SEARCH_FRAGMENTS.length} fragments: ${median(times).toFixed(0)} ms`);

// 100,000 rows (the prepared set repeated) with a first page of 50, as the search screen asks.
const big = Array.from({ length: 100_000 }, (_, i) => stored[i % stored.length] as (typeof stored)[number]);
const pageTimes: number[] = [];
console.log(
  `\nfirst page (50) over ${big.length.toLocaleString("en")} rows: prefilter (in memory here, Postgres in the app) + exactSearchPage`,
);
for (const text of SEARCH_FRAGMENTS) {
  const q = parseFragmentQuery(text);
  if (!q.ok) throw new Error(q.error);
  t0 = performance.now();
  const candidates = big.filter((m) => fingerprintContains(m.fp, q.fingerprint));
  const tFilter = ms(t0);
  const page = exactSearchPage(
    q,
    candidates.map((c) => ({ structureKey: c.key })),
    { limit: 50 },
  );
  const t = ms(t0);
  pageTimes.push(t);
  console.log(
    `  ${text.padEnd(22)} candidates ${String(candidates.length).padStart(6)}  page ${String(page.items.length).padStart(2)}  checked ${String(page.checked).padStart(6)}${page.timedOut ? " (time budget)" : ""}  prefilter ${tFilter.toFixed(0)} ms  total ${t.toFixed(0)} ms`,
  );
}
console.log(`  median over ${SEARCH_FRAGMENTS.length} fragments: ${median(pageTimes).toFixed(0)} ms`);

const sample = prep.prepared.slice(0, 200).map((p) => {
  const r = parseSmiles(p.smiles ?? "");
  if (!r.ok) throw new Error(r.error);
  return r.molecule;
});
const oclIndex = new SSSearcherWithIndex();
t0 = performance.now();
for (const m of sample) oclIndex.createIndex(m);
const tOcl = ms(t0);
console.log(
  `\nopenchemlib SSSearcherWithIndex.createIndex: ${(tOcl / sample.length).toFixed(2)} ms/molecule (not used: ${(((tOcl / sample.length) * N) / 1000).toFixed(0)} s for ${N.toLocaleString("en")})`,
);
t0 = performance.now();
for (const p of prep.prepared.slice(0, 300)) structureSvg(p.properties.structureKey);
console.log(`SVG thumbnails from the structure key: ${(ms(t0) / 300).toFixed(2)} ms each`);
