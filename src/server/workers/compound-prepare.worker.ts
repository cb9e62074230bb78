// A worker thread that runs the chemistry library's import preparation (structure parse,
// properties, fingerprint) on chunks of records, so a 10,000-record import uses both cores and
// the server's event loop stays free. Started by src/server/services/compounds/prepare-pool.ts
// through boot.mjs, which registers tsx (the same TypeScript source as the rest of the server).
// It does not import "server-only": a worker thread is outside React's server condition, and it
// only imports the pure chemistry library. No I/O here.
import { parentPort } from "node:worker_threads";
import { prepareImport } from "@/lib/chem/import-prepare";
import type { ImportRecord } from "@/lib/chem/import-types";

parentPort?.on("message", (msg: { id: number; records: ImportRecord[] }) => {
  try {
    const r = prepareImport(msg.records, { duplicates: "warn" });
    parentPort?.postMessage({ id: msg.id, ok: true, result: r });
  } catch (e) {
    parentPort?.postMessage({ id: msg.id, ok: false, error: e instanceof Error ? e.message : String(e) });
  }
});
