/**
 * Benchmark (not a test): bulk import of 10,000 SMILES records through the registry's own
 * service, as the import page does it — store the CSV in the object store with its SHA-256, parse
 * and prepare every record in the background (two worker threads), check against the registry,
 * then register all of them in ONE transaction (all-or-nothing mode). Goal: under 30 s in total.
 * Run by `npm run bench` (its own Postgres and S3 fake). The molecules are INVENTED.
 */
import crypto from "node:crypto";
import os from "node:os";
import { sql } from "drizzle-orm";
import { db, sqlClient } from "@/server/db/client";
import { users } from "@/server/db/schema";
import { commitImport, getImport, startImport, type ImportPreview } from "@/server/services/compounds";
import { inventedSmiles } from "./_compound-data";

const N = Number(process.argv[2] ?? 10_000);

async function main() {
  const actor = { id: crypto.randomUUID(), email: `bench-${Date.now()}@bench.invalid` };
  await db.insert(users).values({ ...actor, name: "Benchmark user (invented)", globalRole: "admin" });
  const smiles = inventedSmiles(N, 20251201);
  const csv = [
    "smiles,name,supplier,purity_pct,amount_mg",
    ...smiles.map((s, i) => `${s},BENCH-${i + 1},Invented Supplier,98.5,10`),
  ].join("\n");
  const bytes = new TextEncoder().encode(csv);
  const [before] = await db.execute<{ n: number }>(sql`select count(*)::int as n from compounds`);

  const t0 = performance.now();
  const cpu0 = process.cpuUsage();
  const { job, done } = await startImport(actor, { fileName: "bench-10000.csv", contentType: "text/csv", bytes });
  const tStored = performance.now();
  await done;
  const tPrepared = performance.now();
  // Process CPU time (all threads, workers included): the wall time the preparation would take on
  // an otherwise idle machine is about this divided by the number of worker threads.
  const cpuPrepS = (() => {
    const d = process.cpuUsage(cpu0);
    return (d.user + d.system) / 1e6;
  })();
  const prepared = await getImport({ id: actor.id, globalRole: "admin" }, job.id);
  if (prepared.status !== "ready") throw new Error(`import not ready: ${prepared.status} ${prepared.error ?? ""}`);
  const preview = prepared.preview as ImportPreview;
  const result = await commitImport(actor, job.id, preview.invalid === 0 ? "all_or_nothing" : "valid_only");
  const tDone = performance.now();
  const [after] = await db.execute<{ n: number }>(sql`select count(*)::int as n from compounds`);

  const s = (ms: number) => (ms / 1000).toFixed(1);
  console.log(
    `Bulk import of ${N.toLocaleString("en")} SMILES records through the service (${os.availableParallelism()} cores, load average ${os.loadavg()[0]?.toFixed(1)}; preparation on ${preview.threads} worker thread(s))\n`,
  );
  console.log("| step | time (s) |");
  console.log("|---|---:|");
  console.log(`| store in S3 with SHA-256, create job | ${s(tStored - t0)} |`);
  const tm = preview.timings;
  console.log(`| parse + prepare + registry check + staging, in the background | ${s(tPrepared - tStored)} |`);
  if (tm) {
    console.log(`| · parse the CSV and check the fields | ${s(tm.parseMs)} |`);
    console.log(`| · structures, properties, fingerprints (worker threads) | ${s(tm.structuresMs)} |`);
    console.log(`| · look up the registry for duplicates | ${s(tm.checkMs)} |`);
    console.log(`| · keep the prepared records beside the job | ${s(tm.storeMs)} |`);
  }
  console.log(`| register in one transaction (INSERT … SELECT from the staged records) | ${s(tDone - tPrepared)} |`);
  console.log(`| **total** | **${s(tDone - t0)}** |`);
  console.log(
    `\nCPU time of the server process during store + preparation: ${cpuPrepS.toFixed(1)} s (${((1000 * cpuPrepS) / N).toFixed(2)} ms per record over all threads).`,
  );
  const reasons = new Map<string, number>();
  for (const n of result.notRegistered) {
    const key = n.reason
      .replace(/record \d+ \(line \d+\)/, "record N")
      .replace(/"[^"]*"/g, '"…"')
      .slice(0, 80);
    reasons.set(key, (reasons.get(key) ?? 0) + 1);
  }
  for (const [r, k] of reasons) console.log(`  not registered ×${k}: ${r}`);
  console.log(
    `\nrecords ${preview.totalRecords}, registered ${result.registered.length} (${result.registered[0]?.registryId} … ${result.registered.at(-1)?.registryId}), not registered ${new Set(result.notRegistered.map((n) => n.record)).size}; rows added ${(after?.n ?? 0) - (before?.n ?? 0)}`,
  );
  console.log(`goal < 30 s: ${tDone - t0 < 30_000 ? "met" : "NOT met"}`);
}

main()
  .catch((e) => {
    console.error(e);
    process.exitCode = 1;
  })
  .finally(() => sqlClient.end());
