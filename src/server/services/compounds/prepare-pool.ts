import "server-only";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { Worker } from "node:worker_threads";
import type { PrepareResult, PreparedRecord } from "@/lib/chem/import-prepare";
import { AppError } from "@/server/errors";
import type { ChemTask } from "./chem-tasks";
import type { ImportIssue, ImportRecord } from "@/lib/chem/import-types";

/**
 * The one place the server runs chemistry: a small pool of worker threads (one per core, at
 * most 2) that parse, canonicalise, compute properties and fingerprints, draw and match
 * substructures (src/server/workers/compound-prepare.worker.ts). The server's event loop never
 * runs openchemlib, so a large or hostile structure costs its own request time and nobody
 * else's.
 *
 * Every task has a time limit: a worker that overruns is terminated and a fresh one started; the
 * caller gets an AppError with a sentence (413 for a structure too complex to finish, 429 when the
 * queue is full or no worker could start), never a 500 or a hang. Imports report progress per
 * record, and the limit applies per record, so one slow record is reported as an issue and the
 * rest of its chunk goes on in the fresh worker.
 *
 * In-file duplicates of an import are decided here over the whole file in record order (the
 * workers see only their chunk): a record with the structure key of an earlier one is an issue,
 * one that shares only the stereo-free key gets a warning (the rules of import-prepare.ts).
 */
/** Records per import task: small, so a registration waits at most one chunk (~0.15 s) behind an import. */
const CHUNK = 50;
const WORKER_DIR = path.join(process.cwd(), "src", "server", "workers");
/** Time one structure (or one import record) may take; a capped structure takes under 4 s here cold. */
export const STRUCTURE_TIME_LIMIT_MS = 10_000;
/** Waiting tasks beyond this are refused at once (the service is overloaded). */
const MAX_QUEUE = 200;
/** A worker that has not loaded its modules by then is given up. */
const START_LIMIT_MS = 60_000;

type ChunkResult = PrepareResult;

function split<T>(xs: readonly T[], n: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < xs.length; i += n) out.push(xs.slice(i, i + n));
  return out;
}

/**
 * A task was stopped: its time limit ran out ("time") or its worker died under it ("memory": the
 * worker's heap limit, or any other exit). `progress` is the last record index an import task
 * reported, so the record that caused it is known.
 */
export class ChemTimeout extends Error {
  constructor(
    readonly limitMs: number,
    readonly progress: number | null,
    readonly cause: "time" | "memory" = "time",
  ) {
    super(cause === "time" ? `Chemistry task stopped after ${limitMs} ms.` : "Chemistry worker stopped during a task.");
  }
}

type Job = {
  task: ChemTask;
  limitMs: number;
  resolve: (v: unknown) => void;
  reject: (e: unknown) => void;
  onProgress?: (index: number) => void;
  bulk: boolean;
};

type Slot = { worker: Worker | null; starting: Promise<Worker> | null; job: Job | null; progress: number | null };

function startWorker(): Promise<Worker> {
  return new Promise((resolve, reject) => {
    // Started from a one-line script, not a file path, so the Next.js bundler does not try to
    // bundle the worker (and tsx with it): the worker loads the TypeScript source at run time.
    const boot = pathToFileURL(path.join(WORKER_DIR, "boot.mjs")).href;
    const w = new Worker(`import(${JSON.stringify(boot)}).catch((e) => { throw e; });`, {
      eval: true,
      workerData: { file: path.join(WORKER_DIR, "compound-prepare.worker.ts") },
      // Bounds a runaway structure's memory to its worker (terminated on overrun).
      resourceLimits: { maxOldGenerationSizeMb: 512 },
    });
    w.unref(); // an idle pool does not keep a test or CLI process alive
    const timer = setTimeout(() => {
      void w.terminate();
      reject(new Error("The chemistry worker did not start in time."));
    }, START_LIMIT_MS);
    timer.unref();
    const fail = (e: unknown) => {
      clearTimeout(timer);
      reject(e instanceof Error ? e : new Error(String(e)));
    };
    w.once("error", fail);
    w.once("exit", (code) => fail(new Error(`The chemistry worker stopped while starting (exit ${code}).`)));
    const onReady = (m: { ready?: boolean }) => {
      if (!m?.ready) return;
      clearTimeout(timer);
      w.off("message", onReady);
      w.off("error", fail);
      w.removeAllListeners("exit");
      resolve(w);
    };
    w.on("message", onReady);
  });
}

class ChemPool {
  private slots: Slot[];
  private queue: Job[] = [];
  private seq = 0;

  constructor(size: number) {
    this.size = size;
    this.slots = Array.from({ length: size }, () => ({ worker: null, starting: null, job: null, progress: null }));
  }

  readonly size: number;

  /** Interactive tasks (a registration, a drawing, a search) go ahead of waiting import chunks. */
  run<T>(task: ChemTask, limitMs = STRUCTURE_TIME_LIMIT_MS, onProgress?: (index: number) => void): Promise<T> {
    if (this.queue.length >= MAX_QUEUE)
      return Promise.reject(
        new AppError("throttled", "The structure service is busy with other requests; try again in a few seconds.", {
          extra: { retryAfterSeconds: 5 },
        }),
      );
    const bulk = task.kind === "import";
    return new Promise<T>((resolve, reject) => {
      const job = { task, limitMs, resolve: resolve as (v: unknown) => void, reject, onProgress, bulk };
      const at = bulk ? -1 : this.queue.findIndex((j) => j.bulk);
      if (at < 0) this.queue.push(job);
      else this.queue.splice(at, 0, job);
      this.pump();
    });
  }

  private pump() {
    for (const slot of this.slots) {
      if (slot.job || slot.starting || this.queue.length === 0) continue;
      if (!slot.worker) {
        slot.starting = startWorker();
        slot.starting.then(
          (w) => {
            slot.worker = w;
            slot.starting = null;
            // A worker that dies while idle is replaced on the next task, not posted to.
            w.once("exit", () => {
              if (slot.worker === w) slot.worker = null;
            });
            this.pump();
          },
          (e) => {
            slot.starting = null;
            console.error("[inhibitrack] chemistry worker could not start", e);
            // Nobody else can serve the queue if no worker starts: refuse what waits.
            if (this.slots.every((s) => !s.worker && !s.starting))
              for (const j of this.queue.splice(0))
                j.reject(
                  new AppError("throttled", "The structure service could not start; try again in a minute.", {
                    extra: { retryAfterSeconds: 60 },
                  }),
                );
          },
        );
        continue;
      }
      this.dispatch(slot, this.queue.shift()!);
    }
  }

  private dispatch(slot: Slot, job: Job) {
    const w = slot.worker!;
    const id = ++this.seq;
    slot.job = job;
    slot.progress = null;
    let timer: NodeJS.Timeout;
    const arm = () => {
      clearTimeout(timer);
      timer = setTimeout(() => finish(new ChemTimeout(job.limitMs, slot.progress), true), job.limitMs);
    };
    const onMessage = (m: { id: number; ok?: boolean; result?: unknown; error?: string; progress?: number }) => {
      if (m.id !== id) return;
      if (m.progress !== undefined) {
        slot.progress = m.progress;
        job.onProgress?.(m.progress);
        arm();
        return;
      }
      if (!m.ok) console.error("[inhibitrack] chemistry task threw", m.error);
      finish(
        m.ok ? null : new AppError("bad_request", "This structure could not be processed; check it and try again."),
        false,
        m.result,
      );
    };
    const onExit = () => finish(new ChemTimeout(job.limitMs, slot.progress, "memory"), true);
    const onError = (e: Error) => {
      console.error("[inhibitrack] chemistry worker failed during a task", e);
      finish(new ChemTimeout(job.limitMs, slot.progress, "memory"), true);
    };
    const finish = (err: Error | null, kill: boolean, result?: unknown) => {
      clearTimeout(timer);
      w.off("message", onMessage);
      w.off("exit", onExit);
      w.off("error", onError);
      slot.job = null;
      if (kill) {
        slot.worker = null;
        void w.terminate();
      }
      if (err) job.reject(err);
      else job.resolve(result);
      this.pump();
    };
    w.on("message", onMessage);
    w.once("exit", onExit);
    w.once("error", onError);
    arm();
    w.postMessage({ id, task: job.task });
  }
}

const g = globalThis as unknown as { __inhibitrackChemPool?: ChemPool };
/** The process's one pool (kept on globalThis so a dev-server module reload does not start another). */
function pool(): ChemPool {
  g.__inhibitrackChemPool ??= new ChemPool(Math.max(1, Math.min(2, os.availableParallelism())));
  return g.__inhibitrackChemPool;
}

/** A structure-level sentence for a task that ran out of time or memory. */
function tooComplex(what: string, e: ChemTimeout): AppError {
  const how =
    e.cause === "time" ? `took longer than ${e.limitMs / 1000} s` : "needed more memory than a structure is allowed";
  return new AppError(
    "too_large",
    `${what} ${how} and was stopped; the structure is too large or too complex for the registry.`,
  );
}

/** Runs one task in the pool; a timeout becomes a 413 naming `what`. */
export async function runChem<T>(task: ChemTask, what: string, limitMs = STRUCTURE_TIME_LIMIT_MS): Promise<T> {
  try {
    return await pool().run<T>(task, limitMs);
  } catch (e) {
    if (e instanceof ChemTimeout) throw tooComplex(what, e);
    throw e;
  }
}

async function prepareChunk(records: ImportRecord[]): Promise<ChunkResult> {
  const out: ChunkResult = { prepared: [], issues: [], warnings: [] };
  let rest = records;
  while (rest.length > 0) {
    try {
      const r = await pool().run<ChunkResult>({ kind: "import", records: rest }, STRUCTURE_TIME_LIMIT_MS);
      out.prepared.push(...r.prepared);
      out.issues.push(...r.issues);
      out.warnings.push(...r.warnings);
      rest = [];
    } catch (e) {
      if (!(e instanceof ChemTimeout) || e.progress === null) throw e;
      // The record being prepared overran: it is an issue; the records before it are prepared
      // again with the rest (cheaper than keeping partial results across a terminated worker).
      const slow = rest[e.progress]!;
      out.issues.push({
        record: slow.recordNo,
        line: slow.line,
        field: slow.smiles !== undefined ? "smiles" : "molfile",
        message: tooComplex("Preparing this structure", e).message,
      });
      rest = [...rest.slice(0, e.progress), ...rest.slice(e.progress + 1)];
    }
  }
  return out;
}

export type PrepareProgress = (done: number, total: number) => Promise<void> | void;

/** prepareImport over all records in the worker pool (chunks in parallel); results in record order. */
export async function prepareAll(
  records: readonly ImportRecord[],
  onProgress?: PrepareProgress,
): Promise<PrepareResult & { threads: number }> {
  const chunks = split(records, CHUNK);
  const results: ChunkResult[] = new Array(chunks.length);
  const threads = Math.max(1, Math.min(chunks.length, pool().size));
  let next = 0;
  let done = 0;
  // One runner per worker, each taking the next chunk, so progress advances in record order.
  await Promise.all(
    Array.from({ length: threads }, async () => {
      while (next < chunks.length) {
        const i = next++;
        results[i] = await prepareChunk(chunks[i]!);
        done += chunks[i]!.length;
        await onProgress?.(done, records.length);
      }
    }),
  );
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
