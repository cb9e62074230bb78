/**
 * Batch analysis from the command line: the same per-compound analysis as the app's pipeline
 * (src/lib/analysis/compute.ts), so the command prints every outcome, flag, adequacy figure,
 * weighting decision, outlier proposal and alternative model the app stores.
 *
 *   npm run -s analyze -- dose-response FILE.csv [options]
 *   npm run -s analyze -- mechanism FILE.csv [options]
 *
 * `npm run analyze` runs this file prebuilt (scripts/analyze.cjs, an esbuild bundle), and large
 * batches can be split over worker threads (one per core but one, see threadsWanted) with the
 * output in input order, byte for byte as on one thread. JSON on
 * stdout. A file that cannot be read — unreadable, a missing column, a cell that is not a number,
 * a negative concentration, an unknown option — prints one line on stderr naming the line and
 * column, exits with code 2 and prints nothing on stdout. A compound that cannot be fitted gets
 * its own `{"compound", "error"}` object and the others are fitted (exit 0). The fields are
 * documented in docs/science.md. Results are for research use and need review by a qualified
 * scientist.
 */
import { readFileSync, statSync } from "node:fs";
import { availableParallelism } from "node:os";
import { Worker, isMainThread, parentPort, workerData } from "node:worker_threads";
import { ENGINE_VERSION, TableInputError, readDoseResponseCsv, readMechanismCsv } from "../lib/kinetics/index";
import { forEachCsvRow } from "../lib/csv/read";
import { ANALYSIS_WEIGHTINGS, type AnalysisWeighting } from "../lib/analysis/settings";
import type { DoseResponseScale } from "../lib/analysis/compute";
import {
  CompoundError,
  doseResponseJobView,
  mechanismJobView,
  type DoseJob,
  type MechanismJob,
  type ViewOptions,
} from "./analyze-views";

const USAGE = `Inhibitrack analyze (${ENGINE_VERSION})

usage:
  analyze dose-response FILE.csv [--response=auto|inhibition|activity|signal] [--fix-top=N]
                                 [--fix-bottom=N] [--enzyme=CONC] [--weighting=auto|none|relative]
                                 [--robust]
      columns compound, concentration, response. Per compound: outcome (fitted, inactive,
      activator, not-determined), IC50 with its 95 % CI, Hill slope, plateaus, flags, adequacy,
      weighting and proposed outliers. Prints a JSON array in input order.
  analyze mechanism FILE.csv [--enzyme=CONC] [--weighting=auto|none|relative] [--robust]
      columns substrate, inhibitor, rate (any order, header case-insensitive, one concentration
      unit), and optionally compound for a batch. Fits the four inhibition models, judges their
      adequacy, fits the models beyond them the data call for, and prints one JSON object (a
      JSON array, one object per compound, with a compound column).

options:
  --response=…   dose-response: what the response column holds: % inhibition, % activity
                 (100 = vehicle), or a raw signal. auto (default) reads the column's unit:
                 "response (% inhibition)" or "response (%)" is % inhibition, "response (% activity)"
                 is % activity, anything else (no unit, OD, RFU…) a raw signal.
  --enzyme=CONC  total enzyme concentration in the unit of the concentrations: tight-binding check
                 (Morrison).
  --weighting=…  none (default: ordinary least squares, as the published reference fits), auto
                 (relative when the replicates' SD grows with the signal; the app's default), or
                 relative.
  --robust       report the fit without the outliers a robust fit finds (they are proposed either
                 way).

Bad input prints one line on stderr naming the line and column and exits with code 2; a compound
that cannot be fitted gets {"compound", "error"} and the rest are fitted.
Results are for research use only and need review by a qualified scientist.
`;

class UsageError extends Error {}

export type Command = "dose-response" | "mechanism";

export type CommandOptions = ViewOptions;

const RESPONSES: Record<string, DoseResponseScale> = {
  inhibition: "inhibition-pct",
  activity: "activity-pct",
  signal: "signal",
};

const ALLOWED: Record<Command, readonly string[]> = {
  "dose-response": ["response", "fix-top", "fix-bottom", "enzyme", "weighting", "robust"],
  mechanism: ["enzyme", "weighting", "robust"],
};

function parseOptions(command: Command, args: readonly string[]): CommandOptions {
  const allowed = ALLOWED[command];
  const raw: Record<string, string | true> = {};
  for (const a of args) {
    const m = /^--([a-z-]+)(?:=(.*))?$/.exec(a);
    const name = m?.[1];
    if (!m || !name || !allowed.includes(name))
      throw new UsageError(
        `unknown option ${JSON.stringify(a)} for ${command} (allowed: ${allowed.map((o) => (o === "robust" ? "--robust" : `--${o}=…`)).join(", ")})`,
      );
    if (name === "robust") {
      if (m[2] !== undefined) throw new UsageError(`--robust takes no value (got ${JSON.stringify(a)})`);
      raw.robust = true;
    } else {
      if (m[2] === undefined) throw new UsageError(`--${name} needs a value, as --${name}=…`);
      raw[name] = m[2];
    }
  }
  const number = (name: string, positive: boolean): number | null => {
    const v = raw[name];
    if (v === undefined || v === true) return null;
    const x = Number(v);
    if (v.trim() === "" || !Number.isFinite(x) || (positive && !(x > 0)))
      throw new UsageError(`--${name} needs a ${positive ? "positive " : ""}number (got ${JSON.stringify(v)})`);
    return x;
  };
  // The command defaults to ordinary least squares so that a published data set gives its
  // published fit; `auto` (the app's default for new experiments) decides from the replicates.
  const weighting = raw.weighting ?? "none";
  if (weighting === true || !(ANALYSIS_WEIGHTINGS as readonly string[]).includes(weighting))
    throw new UsageError(`--weighting must be auto, none or relative (got ${JSON.stringify(weighting)})`);
  const response = raw.response ?? "auto";
  if (response === true || !(response === "auto" || response in RESPONSES))
    throw new UsageError(`--response must be auto, inhibition, activity or signal (got ${JSON.stringify(response)})`);
  return {
    weighting: weighting as AnalysisWeighting,
    robust: raw.robust === true,
    enzyme: number("enzyme", true),
    fixTop: number("fix-top", false),
    fixBottom: number("fix-bottom", false),
    // "auto" is resolved from the file's header in prepare(); signal until then.
    response: RESPONSES[response === "auto" ? "signal" : response]!,
  };
}

/**
 * What the response column holds, from its unit in the header: "(% inhibition)" or "(%)" is
 * % inhibition, "(% activity)" % activity, anything else a raw signal (a plain "response" header,
 * OD, RFU…), so a curve in instrument units is never judged against % thresholds.
 */
export function responseFromHeader(text: string): DoseResponseScale {
  const first =
    text
      .replace(/^\uFEFF/, "")
      .split(/\r?\n/)
      .find((l) => l.trim() !== "") ?? "";
  for (const cell of first.split(/[,;\t]/)) {
    const m = /^\s*"?\s*response\s*(?:[([]\s*([^)\]]*?)\s*[)\]])?\s*"?\s*$/i.exec(cell);
    if (!m) continue;
    const unit = (m[1] ?? "").toLowerCase();
    if (/activ/.test(unit)) return "activity-pct";
    if (/inhib/.test(unit) || unit === "%") return "inhibition-pct";
    return "signal";
  }
  return "signal";
}

// ---------------------------------------------------------------- reading the file into jobs

function doseJobs(text: string): DoseJob[] {
  // At least one point per compound here: a compound with too few points is reported in its own
  // object by the analysis, not refused with the whole file.
  return readDoseResponseCsv(text, 1, 1).map((s) => ({
    compound: s.compound,
    x: s.concentration,
    y: s.response,
    lines: s.lines,
  }));
}

/** The cell of the header column `name` (case-insensitive, a unit in brackets allowed), or -1. */
function columnIndex(header: readonly string[], name: string): number {
  return header.findIndex(
    (h) =>
      h
        .trim()
        .replace(/\s*[([].*$/, "")
        .trim()
        .toLowerCase() === name,
  );
}

/**
 * The rate matrix, checked by the engine's reader (numbers, units, levels), and split by the
 * optional `compound` column into one job per compound in order of first appearance.
 */
function mechanismJobs(text: string): MechanismJob[] {
  const points = readMechanismCsv(text);
  const compounds = compoundCells(text);
  if (!compounds) return [{ compound: null, points }];
  const jobs = new Map<string, MechanismJob>();
  for (const p of points) {
    const name = compounds.get(p.line) ?? "";
    if (name === "") throw new TableInputError(p.line, "compound", "empty compound name");
    let job = jobs.get(name);
    if (!job) {
      job = { compound: name, points: [] };
      jobs.set(name, job);
    }
    job.points.push(p);
  }
  return [...jobs.values()];
}

/** The `compound` cell of each data line, or null when the header has no such column. */
function compoundCells(text: string): Map<number, string> | null {
  let column = -2;
  const out = new Map<number, string>();
  try {
    forEachCsvRow(text, (row) => {
      if (column === -2) {
        column = columnIndex(row.cells(), "compound");
        if (column < 0) throw new NoCompoundColumn();
      } else if (column < row.count) out.set(row.line, row.cell(column).trim());
    });
  } catch (e) {
    if (e instanceof NoCompoundColumn) return null;
    throw e;
  }
  return column >= 0 ? out : null;
}

class NoCompoundColumn extends Error {}

// ---------------------------------------------------------------- running the jobs

type Jobs = { command: "dose-response"; jobs: DoseJob[] } | { command: "mechanism"; jobs: MechanismJob[] };

/** One JSON text per job, in order. */
function runJobs(work: Jobs, options: CommandOptions, indent: number | undefined): string[] {
  if (work.command === "dose-response") return work.jobs.map((j) => JSON.stringify(doseResponseJobView(j, options)));
  return work.jobs.map((j) => JSON.stringify(mechanismJobView(j, options), null, indent));
}

/**
 * Rough cost of a job in microseconds on this machine's cores (measured with bench/kinetics.mjs:
 * about 5 µs per dose-response point and 25 µs per mechanism point, judgement included).
 */
const jobCost = (work: Jobs, k: number): number =>
  work.command === "dose-response" ? 5 * work.jobs[k]!.x.length : 25 * work.jobs[k]!.points.length;

/**
 * A batch expected to take less than this (µs) runs on the main thread alone: a worker costs a
 * new V8 isolate, the bundle loaded again and its compiler warming up (about 50–100 ms here).
 */
export const PARALLEL_MIN_COST_US = 250_000;
/** Files smaller than this are not worth starting workers for before they are read. */
const PARALLEL_MIN_BYTES = 400_000;

/**
 * Threads to use: ANALYZE_THREADS when set (tests, benchmarks), else one per core but one. A
 * single thread already keeps a second core busy with V8's background compiler and garbage
 * collector (1.05 s of CPU in 0.74 s for 10⁴ curves here), and on this 2-core machine a second
 * analysis thread did not pay: 0.91 s instead of 0.74 s for 10⁴ curves, 1.85 s instead of 1.95 s
 * for 4·10⁴, with 0.5–1 s more CPU (docs/benchmarks.md). Not measured on more cores.
 */
function threadsWanted(): number {
  const env = Number(process.env.ANALYZE_THREADS);
  if (Number.isInteger(env) && env > 0) return env;
  return Math.max(1, Math.min(8, availableParallelism() - 1));
}

/** Contiguous slices of about equal cost, so that concatenating the outputs keeps input order. */
function slices(work: Jobs, parts: number): [number, number][] {
  const n = work.jobs.length;
  let total = 0;
  for (let k = 0; k < n; k++) total += jobCost(work, k);
  const out: [number, number][] = [];
  let start = 0;
  let acc = 0;
  for (let k = 0; k < n && out.length < parts - 1; k++) {
    acc += jobCost(work, k);
    if (acc >= (total * (out.length + 1)) / parts) {
      out.push([start, k + 1]);
      start = k + 1;
    }
  }
  out.push([start, n]);
  return out;
}

function slice(work: Jobs, [a, b]: [number, number]): Jobs {
  return work.command === "dose-response"
    ? { command: work.command, jobs: work.jobs.slice(a, b) }
    : { command: work.command, jobs: work.jobs.slice(a, b) };
}

function totalCost(work: Jobs): number {
  let total = 0;
  for (let k = 0; k < work.jobs.length; k++) total += jobCost(work, k);
  return total;
}

/** What a worker is given: the same argv as the command, and which of `parts` slices is its own. */
interface WorkerInput {
  analyzeWorker: true;
  argv: string[];
  part: number;
  parts: number;
}

/**
 * Workers started before the file is read: each reads and parses the file itself (in parallel
 * with this thread, which parses it too) and analyses its own slice, so their start-up overlaps
 * the reading. Slices are cut the same way on every thread, from the same parsed jobs.
 */
function startWorkers(argv: string[], parts: number): { results: Promise<string[] | null>[]; stop: () => void } {
  const workers = Array.from(
    { length: parts - 1 },
    (_, k) =>
      new Worker(__filename, { workerData: { analyzeWorker: true, argv, part: k + 1, parts } satisfies WorkerInput }),
  );
  const results = workers.map(
    (w) =>
      new Promise<string[] | null>((resolve, reject) => {
        w.once("message", (texts: string[] | null) => resolve(texts));
        w.once("error", reject);
        w.once("exit", (code) => (code === 0 ? resolve(null) : reject(new Error(`analysis worker stopped (${code})`))));
      }),
  );
  // A worker that is not needed (a small batch, bad input) is stopped without a word.
  for (const r of results) r.catch(() => undefined);
  return { results, stop: () => workers.forEach((w) => void w.terminate()) };
}

// ---------------------------------------------------------------- the command

type Prepared = { usage: string } | { work: Jobs; options: CommandOptions; batch: boolean; file: string };

/** Parses argv (without node and script) and reads the file: the work to do, or the usage text. */
function prepare(argv: readonly string[], readFile: (path: string) => string): Prepared {
  const [command, file, ...rest] = argv;
  if (command === undefined || command === "--help" || command === "-h" || command === "help") return { usage: USAGE };
  if (command !== "mechanism" && command !== "dose-response")
    throw new UsageError(`unknown command ${JSON.stringify(command)}; use dose-response or mechanism (see --help)`);
  if (file === undefined || file.startsWith("--")) throw new UsageError(`${command} needs a CSV file (see --help)`);
  const options = parseOptions(command, rest);
  let text: string;
  try {
    text = readFile(file);
  } catch (e) {
    throw new UsageError(`cannot read ${file}: ${(e as Error).message}`);
  }
  try {
    if (command === "dose-response") {
      const auto = !rest.some((a) => a.startsWith("--response=")) || rest.includes("--response=auto");
      const resolved = auto ? { ...options, response: responseFromHeader(text) } : options;
      return { work: { command, jobs: doseJobs(text) }, options: resolved, batch: true, file };
    }
    const jobs = mechanismJobs(text);
    return { work: { command, jobs }, options, batch: jobs[0]?.compound !== null, file };
  } catch (e) {
    if (e instanceof TableInputError) throw new UsageError(`${file} ${e.message}`);
    throw e;
  }
}

/** The output of a prepared command; `threads` > 1 when workers were started and will share the batch. */
async function output(p: Prepared, threads: number, workers: Promise<string[] | null>[]): Promise<string> {
  if ("usage" in p) return p.usage;
  if (!p.batch) {
    try {
      return runJobs(p.work, p.options, 2)[0]! + "\n";
    } catch (e) {
      // The whole file is one data set: nothing else to report, so it is bad input.
      if (e instanceof CompoundError) throw new UsageError(`${p.file} ${e.message}`);
      throw e;
    }
  }
  const forced = Number(process.env.ANALYZE_THREADS) > 1;
  if (threads > 1 && (forced || totalCost(p.work) >= PARALLEL_MIN_COST_US)) {
    const own = runJobs(slice(p.work, slices(p.work, threads)[0]!), p.options, undefined);
    const rest = await Promise.all(workers);
    if (rest.every((r) => r !== null)) return "[\n" + own.concat(...rest).join(",\n") + "\n]\n";
  }
  return "[\n" + runJobs(p.work, p.options, undefined).join(",\n") + "\n]\n";
}

/** Runs the command on argv (without node and script) and returns stdout; throws on bad input. */
export async function runAnalyze(argv: readonly string[], readFile: (path: string) => string): Promise<string> {
  return output(prepare(argv, readFile), 1, []);
}

async function main(): Promise<void> {
  const argv = process.argv.slice(2);
  let workers: ReturnType<typeof startWorkers> = { results: [], stop: () => undefined };
  let threads = 1;
  // Workers need the prebuilt bundle: this file must be plain JavaScript to be loaded by one.
  const bundled = typeof __filename === "string" && __filename.endsWith(".cjs");
  const file = argv[1];
  if (bundled && file && (argv[0] === "dose-response" || argv[0] === "mechanism") && threadsWanted() > 1) {
    let size = 0;
    try {
      size = statSync(file).size;
    } catch {
      // unreadable: prepare() says so
    }
    if (size >= PARALLEL_MIN_BYTES || Number(process.env.ANALYZE_THREADS) > 1) {
      threads = threadsWanted();
      workers = startWorkers(argv, threads);
    }
  }
  try {
    process.stdout.write(
      await output(
        prepare(argv, (p) => readFileSync(p, "utf8")),
        threads,
        workers.results,
      ),
    );
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    process.stderr.write(`error: ${message.replace(/\s*\n\s*/g, " ")}\n`);
    // Bad input and usage errors exit 2; an unexpected failure exits 1.
    process.exitCode = e instanceof UsageError || e instanceof RangeError ? 2 : 1;
  } finally {
    // Workers still parsing a file that turned out small or bad are not waited for.
    workers.stop();
  }
}

/** A worker: the same file parsed the same way, its own slice analysed. */
function workerMain(input: WorkerInput): void {
  let texts: string[] | null = null;
  try {
    const p = prepare(input.argv, (f) => readFileSync(f, "utf8"));
    if (!("usage" in p) && p.batch) {
      const forced = Number(process.env.ANALYZE_THREADS) > 1;
      if (forced || totalCost(p.work) >= PARALLEL_MIN_COST_US) {
        const part = slices(p.work, input.parts)[input.part]!;
        texts = runJobs(slice(p.work, part), p.options, undefined);
      }
    }
  } catch {
    texts = null; // the main thread reports bad input
  }
  parentPort!.postMessage(texts);
}

/**
 * Run as the command (the launcher scripts/analyze.cjs, the bundle itself, or this file under
 * tsx), not when a test imports one of its functions.
 */
const isEntry = /(^|[\\/])analyze\.(ts|cjs)$/.test(process.argv[1] ?? "");

const asWorker = workerData as Partial<WorkerInput> | null;
if (isMainThread) {
  if (isEntry) void main();
} else if (asWorker?.analyzeWorker === true) workerMain(asWorker as WorkerInput);
