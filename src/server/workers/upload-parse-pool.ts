import "server-only";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { Worker } from "node:worker_threads";
import { AppError } from "@/server/errors";
import type { ReaderExportResult } from "@/lib/plates/reader-export";
import type { ImportParseResult } from "@/lib/chem/import-types";
import type { PlateMapParseResult } from "@/lib/plates/plate-map";
import type { UploadParseOutcome, UploadParseTask } from "./upload-parse";

/**
 * Uploads are parsed in worker threads, never in the server's own thread: a small pool (two
 * workers on this 2-core machine) kept warm so an ordinary upload does not pay a worker's start,
 * each worker with a heap limit, and a wall-time limit after which the worker is terminated and
 * replaced. A parse that trips a limit is refused with a sentence (400); when the queue is full
 * the upload is refused with 429 rather than waiting without end.
 */
export const PARSE_TIME_LIMIT_MS = 20_000;
/** Heap of one worker: room for exceljs on a workbook at the 100 MB inflate cap (chosen here, not measured). */
export const PARSE_HEAP_MB = 1024;
const POOL_SIZE = 2;
const MAX_QUEUED = 16;
const WORKER_DIR = path.join(process.cwd(), "src", "server", "workers");

type Result = UploadParseOutcome;
type Job = {
  task: UploadParseTask;
  label: string;
  timeLimitMs: number;
  resolve: (r: Result) => void;
  reject: (e: unknown) => void;
};
type Slot = { worker: Worker; busy: boolean; ready: Promise<void> };

const idle: Slot[] = [];
const slots = new Set<Slot>();
const queue: Job[] = [];
let seq = 0;

function spawn(): Slot {
  // Started from a one-line script, not a file path, so the Next.js bundler leaves the worker
  // (and tsx, which boot.mjs registers) alone: it loads the TypeScript source at run time.
  const boot = pathToFileURL(path.join(WORKER_DIR, "boot.mjs")).href;
  const worker = new Worker(`import(${JSON.stringify(boot)}).catch((e) => { throw e; });`, {
    eval: true,
    workerData: { file: path.join(WORKER_DIR, "upload-parse.worker.ts") },
    resourceLimits: { maxOldGenerationSizeMb: PARSE_HEAP_MB, maxYoungGenerationSizeMb: 64, stackSizeMb: 8 },
  });
  worker.unref();
  const ready = new Promise<void>((resolve, reject) => {
    worker.once("online", () => resolve());
    worker.once("error", reject);
  });
  ready.catch(() => undefined);
  const slot: Slot = { worker, busy: false, ready };
  slots.add(slot);
  worker.once("exit", () => {
    slots.delete(slot);
    const i = idle.indexOf(slot);
    if (i >= 0) idle.splice(i, 1);
  });
  return slot;
}

function retire(slot: Slot): void {
  slots.delete(slot);
  void slot.worker.terminate();
}

function limitError(job: Job, kind: "time" | "memory" | "crash"): AppError {
  const msg =
    kind === "time"
      ? `${job.label}: parsing took longer than ${job.timeLimitMs / 1000} s; the file was refused`
      : kind === "memory"
        ? `${job.label}: reading the file needs more than ${PARSE_HEAP_MB} MB of memory; the file was refused`
        : `${job.label}: the file could not be parsed (the parser stopped)`;
  return new AppError("bad_request", msg, { details: [{ field: "file", message: msg }] });
}

async function runOn(slot: Slot, job: Job): Promise<void> {
  // A busy worker keeps the process alive (a command-line seed has nothing else to wait on); an
  // idle one does not hold a finished process open.
  slot.worker.ref();
  try {
    await runJob(slot, job);
  } finally {
    slot.worker.unref();
  }
}

async function runJob(slot: Slot, job: Job): Promise<void> {
  try {
    await slot.ready;
  } catch (e) {
    retire(slot);
    throw e;
  }
  const id = ++seq;
  await new Promise<void>((finish) => {
    let over = false;
    const end = (fn: () => void, keep: boolean) => {
      if (over) return;
      over = true;
      clearTimeout(timer);
      slot.worker.off("message", onMessage);
      slot.worker.off("error", onError);
      slot.worker.off("exit", onExit);
      if (!keep) retire(slot);
      fn();
      finish();
    };
    const timer = setTimeout(() => end(() => job.reject(limitError(job, "time")), false), job.timeLimitMs);
    const onMessage = (m: { id: number; ok: boolean; result?: Result; error?: string }) => {
      if (m.id !== id) return;
      if (m.ok && m.result) end(() => job.resolve(m.result!), true);
      else {
        console.error("[inhibitrack] upload parse failed in its worker:", m.error);
        end(() => job.reject(limitError(job, "crash")), true);
      }
    };
    const onError = (e: Error & { code?: string }) =>
      end(() => job.reject(limitError(job, e.code === "ERR_WORKER_OUT_OF_MEMORY" ? "memory" : "crash")), false);
    const onExit = () => end(() => job.reject(limitError(job, "crash")), false);
    slot.worker.on("message", onMessage);
    slot.worker.on("error", onError);
    slot.worker.on("exit", onExit);
    slot.worker.postMessage({ id, task: job.task });
  });
}

function pump(): void {
  while (queue.length > 0) {
    let slot = idle.pop();
    if (!slot && slots.size < POOL_SIZE) slot = spawn();
    if (!slot) return;
    const job = queue.shift()!;
    const s = slot;
    s.busy = true;
    runOn(s, job)
      .catch((e: unknown) => {
        // A worker that cannot start at all (a broken install): say so in the log, refuse politely.
        console.error("[inhibitrack] an upload-parse worker did not start", e);
        job.reject(new AppError("internal", "The upload parser could not be started."));
      })
      .finally(() => {
        s.busy = false;
        if (slots.has(s)) idle.push(s);
        pump();
      });
  }
}

/** Parse an upload in the pool; `label` names the file in a limit's message. */
export function parseInWorker(
  task: Extract<UploadParseTask, { kind: "plate-export" }>,
  label: string,
  opts?: { timeLimitMs?: number },
): Promise<ReaderExportResult>;
export function parseInWorker(
  task: Extract<UploadParseTask, { kind: "compound-import" }>,
  label: string,
  opts?: { timeLimitMs?: number },
): Promise<ImportParseResult>;
export function parseInWorker(
  task: Extract<UploadParseTask, { kind: "plate-map-csv" | "plate-map-json" }>,
  label: string,
  opts?: { timeLimitMs?: number },
): Promise<PlateMapParseResult>;
export function parseInWorker(
  task: UploadParseTask,
  label: string,
  opts: { timeLimitMs?: number } = {},
): Promise<Result> {
  if (queue.length >= MAX_QUEUED)
    return Promise.reject(
      new AppError("throttled", "The server is parsing many uploads at the moment; please try again in a minute.", {
        extra: { retryAfterSeconds: 30 },
      }),
    );
  return new Promise<Result>((resolve, reject) => {
    queue.push({ task, label, timeLimitMs: opts.timeLimitMs ?? PARSE_TIME_LIMIT_MS, resolve, reject });
    pump();
  });
}

/** Workers now alive (for tests: a tripped limit leaves no runaway worker behind). */
export const liveParseWorkers = (): number => slots.size;
