/**
 * Batch analysis from the command line: the same per-compound analysis as the app's pipeline
 * (src/lib/analysis/compute.ts), so the command prints every outcome, flag, adequacy figure,
 * weighting decision, outlier proposal and alternative model the app stores.
 *
 *   npm run -s analyze -- dose-response FILE.csv [options]
 *   npm run -s analyze -- mechanism FILE.csv [options]
 *
 * `npm run analyze` runs this file prebuilt (scripts/analyze.cjs, an esbuild bundle), and large
 * batches are split over worker threads (one per core) with the output in input order. JSON on
 * stdout. A file that cannot be read — unreadable, a missing column, a cell that is not a number,
 * a negative concentration, an unknown option — prints one line on stderr naming the line and
 * column, exits with code 2 and prints nothing on stdout. A compound that cannot be fitted gets
 * its own `{"compound", "error"}` object and the others are fitted (exit 0). The fields are
 * documented in docs/science.md. Results are for research use and need review by a qualified
 * scientist.
 */
import { readFileSync } from "node:fs";
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
  analyze dose-response FILE.csv [--response=inhibition|activity|signal] [--fix-top=N]
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
  --response=…   dose-response: what the response column holds: % inhibition (default), % activity
                 (100 = vehicle), or a raw signal.
  --enzyme=CONC  total enzyme concentration in the unit of the concentrations: tight-binding check
                 (Morrison).
  --weighting=…  auto (default: relative when the replicates' SD grows with the signal), none, or
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
  const weighting = raw.weighting ?? "auto";
  if (weighting === true || !(ANALYSIS_WEIGHTINGS as readonly string[]).includes(weighting))
    throw new UsageError(`--weighting must be auto, none or relative (got ${JSON.stringify(weighting)})`);
  const response = raw.response ?? "inhibition";
  if (response === true || !(response in RESPONSES))
    throw new UsageError(`--response must be inhibition, activity or signal (got ${JSON.stringify(response)})`);
  return {
    weighting: weighting as AnalysisWeighting,
    robust: raw.robust === true,
    enzyme: number("enzyme", true),
    fixTop: number("fix-top", false),
    fixBottom: number("fix-bottom", false),
    response: RESPONSES[response]!,
  };
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

/** Rough cost of a job in fitted points (a mechanism point costs about eight dose-response points). */
const jobWeight = (work: Jobs, k: number): number =>
  work.command === "dose-response" ? work.jobs[k]!.x.length : 8 * work.jobs[k]!.points.length;

/**
 * Below this many weighted points a batch runs on the main thread: a worker costs a new V8
 * isolate, the bundle loaded again and its compiler warming up (about 50–80 ms here), which only
 * pays off for batches that take several times that.
 */
export const PARALLEL_MIN_WEIGHT = 20_000;

function threadCount(work: Jobs): number {
  const env = Number(process.env.ANALYZE_THREADS);
  const cores = Number.isInteger(env) && env > 0 ? env : availableParallelism();
  if (cores <= 1 || work.jobs.length < 2) return 1;
  // Workers need the prebuilt bundle (the file itself must be plain JavaScript).
  if (typeof __filename !== "string" || !__filename.endsWith(".cjs")) return 1;
  let total = 0;
  for (let k = 0; k < work.jobs.length; k++) total += jobWeight(work, k);
  if (total < PARALLEL_MIN_WEIGHT && !(Number.isInteger(env) && env > 1)) return 1;
  return Math.min(cores, work.jobs.length);
}

/** Contiguous slices of about equal weight, so that concatenating the outputs keeps input order. */
function slices(work: Jobs, parts: number): [number, number][] {
  const n = work.jobs.length;
  let total = 0;
  for (let k = 0; k < n; k++) total += jobWeight(work, k);
  const out: [number, number][] = [];
  let start = 0;
  let acc = 0;
  for (let k = 0; k < n && out.length < parts - 1; k++) {
    acc += jobWeight(work, k);
    if (acc >= (total * (out.length + 1)) / parts) {
      out.push([start, k + 1]);
      start = k + 1;
    }
  }
  out.push([start, n]);
  return out.filter(([a, b]) => b > a);
}

interface WorkerInput {
  work: Jobs;
  options: CommandOptions;
  indent: number | undefined;
}

function slice(work: Jobs, [a, b]: [number, number]): Jobs {
  return work.command === "dose-response"
    ? { command: work.command, jobs: work.jobs.slice(a, b) }
    : { command: work.command, jobs: work.jobs.slice(a, b) };
}

/** The jobs' JSON texts in input order, the first slice on this thread and the rest on workers. */
async function runParallel(work: Jobs, options: CommandOptions, indent: number | undefined): Promise<string[]> {
  const threads = threadCount(work);
  if (threads === 1) return runJobs(work, options, indent);
  const parts = slices(work, threads);
  const workers = parts.slice(1).map(
    (part) =>
      new Promise<string[]>((resolve, reject) => {
        const input: WorkerInput = { work: slice(work, part), options, indent };
        const w = new Worker(__filename, { workerData: input });
        w.once("message", (texts: string[]) => resolve(texts));
        w.once("error", reject);
        w.once("exit", (code) => {
          if (code !== 0) reject(new Error(`analysis worker stopped with code ${code}`));
        });
      }),
  );
  const first = runJobs(slice(work, parts[0]!), options, indent);
  const rest = await Promise.all(workers);
  return first.concat(...rest);
}

// ---------------------------------------------------------------- the command

/** Parses argv (without node and script) and reads the file: the work to do, or the usage text. */
function prepare(
  argv: readonly string[],
  readFile: (path: string) => string,
): { usage: string } | { work: Jobs; options: CommandOptions; batch: boolean; file: string } {
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
    if (command === "dose-response") return { work: { command, jobs: doseJobs(text) }, options, batch: true, file };
    const jobs = mechanismJobs(text);
    return { work: { command, jobs }, options, batch: jobs[0]?.compound !== null, file };
  } catch (e) {
    if (e instanceof TableInputError) throw new UsageError(`${file} ${e.message}`);
    throw e;
  }
}

/** Runs the command on argv (without node and script) and returns stdout; throws on bad input. */
export async function runAnalyze(argv: readonly string[], readFile: (path: string) => string): Promise<string> {
  const p = prepare(argv, readFile);
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
  const texts = await runParallel(p.work, p.options, undefined);
  return "[\n" + texts.join(",\n") + "\n]\n";
}

async function main(): Promise<void> {
  try {
    process.stdout.write(await runAnalyze(process.argv.slice(2), (p) => readFileSync(p, "utf8")));
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    process.stderr.write(`error: ${message.replace(/\s*\n\s*/g, " ")}\n`);
    // Bad input and usage errors exit 2; an unexpected failure exits 1.
    process.exitCode = e instanceof UsageError || e instanceof RangeError ? 2 : 1;
  }
}

if (isMainThread) void main();
else {
  const input = workerData as WorkerInput;
  parentPort!.postMessage(runJobs(input.work, input.options, input.indent));
}
