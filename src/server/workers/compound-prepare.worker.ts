// A worker thread for every piece of chemistry the server does: structure preparation (parse,
// canonical key, properties, fingerprint) for one structure or a chunk of import records,
// drawings (SVG), substructure query parsing and the exact substructure check. The server's event
// loop never runs openchemlib, so one large or hostile structure cannot stall other requests; the
// pool (src/server/services/compounds/prepare-pool.ts) ends a worker that overruns its time limit
// and starts a fresh one. Started through boot.mjs, which registers tsx (the same TypeScript
// source as the rest of the server). It does not import "server-only": a worker thread is outside
// React's server condition, and it only imports the pure chemistry library. No I/O here.
import { parentPort } from "node:worker_threads";
import { prepareImport } from "@/lib/chem/import-prepare";
import type { ImportRecord } from "@/lib/chem/import-types";
import { parseStructure } from "@/lib/chem/parse";
import { computeProperties } from "@/lib/chem/properties";
import { fingerprint, toBitString } from "@/lib/chem/fingerprint";
import { structureSvg, type SvgOptions } from "@/lib/chem/svg";
import { exactSearchPage, parseFragmentQuery, type SearchPageOptions } from "@/lib/chem/substructure";
import type { ChemTask } from "@/server/services/compounds/chem-tasks";

function run(task: ChemTask, id: number): unknown {
  switch (task.kind) {
    case "prepare": {
      const parsed = parseStructure(task.input);
      if (!parsed.ok) return { ok: false, error: parsed.error };
      return {
        ok: true,
        properties: computeProperties(parsed.molecule),
        fingerprintBits: toBitString(fingerprint(parsed.molecule, false)),
        removedComponents: parsed.removedComponents,
        warnings: parsed.warnings,
      };
    }
    case "svg":
      return task.items.map((it: { key: string; options: SvgOptions }) => {
        try {
          return structureSvg(it.key, it.options);
        } catch {
          return null;
        }
      });
    case "query": {
      const q = parseFragmentQuery(task.text);
      if (!q.ok) return { ok: false, error: q.error };
      return { ok: true, understoodAs: q.understoodAs, bits: toBitString(q.fingerprint) };
    }
    case "search": {
      const q = parseFragmentQuery(task.text);
      if (!q.ok) return { ok: false, error: q.error };
      const page = exactSearchPage(q, task.candidates, task.options as SearchPageOptions);
      return {
        ok: true,
        ids: page.items.map((c) => c.id),
        matched: page.matched,
        checked: page.checked,
        complete: page.complete,
        timedOut: page.timedOut,
      };
    }
    case "import": {
      // One record at a time with a progress message before each, so the pool knows which record
      // overran when it has to stop this worker. The results are the same as one call over the
      // chunk: in-file duplicates are decided by the pool over the whole file.
      const out = { prepared: [] as unknown[], issues: [] as unknown[], warnings: [] as unknown[] };
      task.records.forEach((rec: ImportRecord, index: number) => {
        parentPort?.postMessage({ id, progress: index });
        const r = prepareImport([rec], { duplicates: "warn" });
        out.prepared.push(...r.prepared);
        out.issues.push(...r.issues);
        out.warnings.push(...r.warnings);
      });
      return out;
    }
  }
}

parentPort?.on("message", (msg: { id: number; task: ChemTask }) => {
  try {
    parentPort?.postMessage({ id: msg.id, ok: true, result: run(msg.task, msg.id) });
  } catch (e) {
    parentPort?.postMessage({ id: msg.id, ok: false, error: e instanceof Error ? e.message : String(e) });
  }
});
parentPort?.postMessage({ ready: true });
