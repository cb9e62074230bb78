import "server-only";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { Worker } from "node:worker_threads";
import { prepareImport, type PrepareResult, type PreparedRecord } from "@/lib/chem/import-prepare";
import type { ImportIssue, ImportRecord } from "@/lib/chem/import-types";

/**
 * Import preparation (about 2.5–3 ms per record with openchemlib, measured in bench/chem.ts) split
 * over worker threads, one per core up to 2, in chunks of CHUNK records so progress can be
 * reported. Small imports (and any failure to start a worker) run in this thread, yielding to the
 * event loop between chunks so the server keeps answering.
 *
 * In-file duplicates are decided here over the whole file in record order (the workers see only
 * their chunk): a record with the structure key of an earlier one is an issue, one that shares
 * only the stereo-free key gets a warning (the rules of import-prepare.ts).
 */
const CHUNK = 250;
const PARALLEL_FROM = 600;
const WORKER_DIR = path.join(process.cwd(), "src", "server", "workers");

type ChunkResult = PrepareResult;

function split<T>(xs: readonly T[], n: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < xs.length; i += n) out.push(xs.slice(i, i + n));
  return out;
}

const yieldToLoop = () => new Promise<void>((r) => setImmediate(r));

async function inThread(
  chunks: ImportRecord[][],
  onChunk: (i: number, r: ChunkResult) => Promise<void> | void,
): Promise<void> {
  for (const [i, c] of chunks.entries()) {
    await onChunk(i, prepareImport(c, { duplicates: "warn" }));
    await yieldToLoop();
  }
}

function startWorker(): Promise<Worker> {
  return new Promise((resolve, reject) => {
    // Started from a one-line script, not a file path, so the Next.js bundler does not try to
    // bundle the worker (and tsx with it): the worker loads the TypeScript source at run time.
    const boot = pathToFileURL(path.join(WORKER_DIR, "boot.mjs")).href;
    const w = new Worker(`import(${JSON.stringify(boot)}).catch((e) => { throw e; });`, {
      eval: true,
      workerData: { file: path.join(WORKER_DIR, "compound-prepare.worker.ts") },
    });
    const fail = (e: unknown) => reject(e instanceof Error ? e : new Error(String(e)));
    w.once("online", () => {
      w.off("error", fail);
      resolve(w);
    });
    w.once("error", fail);
  });
}

async function inWorkers(
  count: number,
  chunks: ImportRecord[][],
  onChunk: (i: number, r: ChunkResult) => Promise<void> | void,
): Promise<void> {
  const workers = await Promise.all(Array.from({ length: count }, startWorker));
  let next = 0;
  try {
    await Promise.all(
      workers.map(
        (w) =>
          new Promise<void>((resolve, reject) => {
            const send = () => {
              if (next >= chunks.length) return resolve();
              const id = next++;
              w.postMessage({ id, records: chunks[id] });
            };
            w.on("message", (m: { id: number; ok: boolean; result?: ChunkResult; error?: string }) => {
              if (!m.ok || !m.result) return reject(new Error(`Preparing records failed: ${m.error ?? "no result"}`));
              Promise.resolve(onChunk(m.id, m.result)).then(send, reject);
            });
            w.once("error", reject);
            w.once("exit", (code) =>
              code !== 0 ? reject(new Error(`A preparation worker stopped (exit ${code}).`)) : undefined,
            );
            send();
          }),
      ),
    );
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
}

export type PrepareProgress = (done: number, total: number) => Promise<void> | void;

/** prepareImport over all records, in parallel where it pays; results in record order. */
export async function prepareAll(
  records: readonly ImportRecord[],
  onProgress?: PrepareProgress,
  opts: { threads?: number } = {},
): Promise<PrepareResult & { threads: number }> {
  const chunks = split(records, CHUNK);
  const results: ChunkResult[] = new Array(chunks.length);
  let done = 0;
  const onChunk = async (i: number, r: ChunkResult) => {
    results[i] = r;
    done += chunks[i]!.length;
    await onProgress?.(done, records.length);
  };
  let threads = opts.threads ?? (records.length >= PARALLEL_FROM ? Math.min(2, os.availableParallelism()) : 0);
  if (threads > 0) {
    try {
      await inWorkers(threads, chunks, onChunk);
    } catch (e) {
      console.error("[inhibitrack] preparation workers failed; preparing in the server thread", e);
      threads = 0;
      done = 0;
      await inThread(chunks, onChunk);
    }
  } else await inThread(chunks, onChunk);
  return { ...merge(results), threads };
}

const DUP_PREFIX = "Same structure as record";
const STEREO_PREFIX = "Another stereo form of record";

function merge(results: ChunkResult[]): PrepareResult {
  const prepared: PreparedRecord[] = [];
  const issues: ImportIssue[] = [];
  const warnings: ImportIssue[] = [];
  const byKey = new Map<string, PreparedRecord>();
  const byFlat = new Map<string, PreparedRecord>();
  for (const r of results) {
    issues.push(...r.issues);
    warnings.push(
      ...r.warnings.filter((w) => !w.message.startsWith(DUP_PREFIX) && !w.message.startsWith(STEREO_PREFIX)),
    );
    for (const p of r.prepared) {
      const field = p.smiles !== undefined ? "smiles" : "molfile";
      const first = byKey.get(p.properties.structureKey);
      if (first) {
        issues.push({
          record: p.recordNo,
          line: p.line,
          field,
          message: `Same structure as record ${first.recordNo} (line ${first.line}).`,
        });
        continue;
      }
      byKey.set(p.properties.structureKey, p);
      const sibling = byFlat.get(p.properties.flatKey);
      if (sibling)
        warnings.push({
          record: p.recordNo,
          line: p.line,
          field,
          message: `Another stereo form of record ${sibling.recordNo} (line ${sibling.line}); both will be registered.`,
        });
      else byFlat.set(p.properties.flatKey, p);
      prepared.push(p);
    }
  }
  const byRecord = (a: ImportIssue, b: ImportIssue) => a.record - b.record;
  return { prepared, issues: issues.sort(byRecord), warnings: warnings.sort(byRecord) };
}
