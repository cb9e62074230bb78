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
    // Read from the file's header in prepare().
    concentrationUnit: null,
  };
}

/**
 * The concentration unit the header names, for the sentences: "concentration (µM)" for
 * dose-response, "substrate (µM)" or "inhibitor (µM)" for mechanism (the reader has already
 * required the two to agree). Null when there is none or it does not look like a unit label
 * (at most 12 letters, digits, "/", "." or spaces): the sentences then give bare numbers.
 */
export function concentrationUnitFromHeader(text: string, command: Command): string | null {
  const names = command === "dose-response" ? ["concentration"] : ["substrate", "inhibitor"];
  for (const cell of firstNonBlankLine(text).split(/[,;\t]/)) {
    const m = /^\s*"?\s*([a-z]+)\s*[([]\s*([^)\]]*?)\s*[)\]]\s*"?\s*$/i.exec(cell);
    if (!m || !names.includes(m[1]!.toLowerCase())) continue;
    const unit = m[2]!;
    return /^[\p{L}\d/. ]{1,12}$/u.test(unit) ? unit : null;
  }
  return null;
}

/**
 * What the response column holds, from its unit in the header: "(% inhibition)" or "(%)" is
 * % inhibition, "(% activity)" % activity, anything else a raw signal (a plain "response" header,
 * OD, RFU…), so a curve in instrument units is never judged against % thresholds.
 */
export function responseFromHeader(text: string): DoseResponseScale {
  const first = firstNonBlankLine(text);
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

/**
 * The first line (split at LF, a CR before it dropped, a leading BOM ignored) that is not blank
 * after trimming, or "": found without splitting the whole file (a batch file has 10⁵ lines).
 */
function firstNonBlankLine(text: string): string {
  let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  while (pos < text.length) {
    let end = text.indexOf("\n", pos);
    if (end === -1) end = text.length;
    const line = text.slice(pos, end > pos && text.charCodeAt(end - 1) === 13 ? end - 1 : end);
    if (line.trim() !== "") return line;
    pos = end + 1;
  }
  return "";
}

// ---------------------------------------------------------------- reading the file into jobs

function doseJobs(text: string): DoseJob[] {
  const fast = plainDoseJobs(text);
  if (fast) return fast;
  // At least one point per compound here: a compound with too few points is reported in its own
  // object by the analysis, not refused with the whole file.
  return readDoseResponseCsv(text, 1, 1).map((s) => ({
    compound: s.compound,
    x: s.concentration,
    y: s.response,
    lines: s.lines,
  }));
}

const DOSE_COLUMNS = ["compound", "concentration", "response"] as const;

/**
 * The batch file in its plain form, read with a tight loop: exactly the three columns (a unit in
 * brackets allowed in the header), no quotes, LF line ends, decimal numbers written without
 * spaces, no empty names. Anything else — including every kind of bad input — returns null and
 * goes through the engine's reader (readDoseResponseCsv), which gives the same jobs for the plain
 * form and the located message otherwise. The engine's reader takes about 70 ms of CPU for 10⁵
 * rows here, this loop about 20 ms (docs/benchmarks.md).
 */
export function plainDoseJobs(text: string): DoseJob[] | null {
  if (text.includes('"') || text.includes("\r")) return null;
  let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  const len = text.length;
  let end = text.indexOf("\n", pos);
  if (end === -1) return null;
  const header = text.slice(pos, end).split(",").map(headerName);
  if (header.length !== 3) return null;
  const [ci, xi, yi] = DOSE_COLUMNS.map((name) => header.indexOf(name)) as [number, number, number];
  if (ci < 0 || xi < 0 || yi < 0 || ci === xi || ci === yi || xi === yi) return null;
  const byName = new Map<string, DoseJob>();
  let current: DoseJob | null = null;
  const starts = [0, 0, 0];
  const ends = [0, 0, 0];
  let line = 1;
  pos = end + 1;
  while (pos < len) {
    line++;
    end = text.indexOf("\n", pos);
    if (end === -1) end = len;
    const c1 = text.indexOf(",", pos);
    if (c1 === -1 || c1 >= end) {
      // A line without a delimiter is one cell: skipped when blank, else a short row (an error).
      if (text.slice(pos, end).trim() !== "") return null;
      pos = end + 1;
      continue;
    }
    const c2 = text.indexOf(",", c1 + 1);
    if (c2 === -1 || c2 >= end) return null;
    const c3 = text.indexOf(",", c2 + 1);
    if (c3 !== -1 && c3 < end) return null;
    starts[1] = c1 + 1;
    starts[2] = c2 + 1;
    ends[0] = c1;
    ends[1] = c2;
    ends[2] = end;
    starts[0] = pos;
    const x = plainNumber(text, starts[xi]!, ends[xi]!);
    const y = plainNumber(text, starts[yi]!, ends[yi]!);
    if (x === null || y === null || x < 0) return null;
    // Rows of one compound are usually consecutive: the name is compared in place, not sliced.
    const a = starts[ci]!;
    const b = ends[ci]!;
    let job: DoseJob | undefined;
    if (
      current !== null &&
      b - a === current.compound.length &&
      text.charCodeAt(a) > 32 &&
      text.charCodeAt(b - 1) > 32 &&
      text.startsWith(current.compound, a)
    )
      job = current;
    else {
      const compound = text.slice(a, b).trim();
      if (compound === "") return null;
      job = byName.get(compound);
      if (!job) {
        job = { compound, x: [], y: [], lines: [] };
        byName.set(compound, job);
      }
    }
    current = job;
    job.x.push(x);
    job.y.push(y);
    job.lines.push(line);
    pos = end + 1;
  }
  return byName.size > 0 ? [...byName.values()] : null;
}

/** A header cell's column name as the engine's reader matches it (table-input.ts, headerKey). */
function headerName(raw: string): string {
  const t = raw.trim();
  const m = /^(.*?)\s*[([]\s*([^)\]]*?)\s*[)\]]\s*$/.exec(t);
  return (m ? m[1]!.trim() : t).toLowerCase();
}

/**
 * The value of the cell text[from, to) when it is written as the engine's reader requires,
 * [+-]digits[.digits][e[+-]digits] (table-input.ts's NUMBER), and finite; null for anything else
 * (spaces included). Reads the file's own string without slicing it and never past `to`
 * (charCodeAt out of range is a slow path in V8).
 *
 * The value is Number()'s: with at most 15 significant digits m and a decimal exponent |k| ≤ 22,
 * m and 10^k are exact doubles and one IEEE multiplication or division rounds correctly, so
 * m·10^k equals the correctly rounded decimal (Clinger, "How to read floating point numbers
 * accurately", PLDI 1990, the fast path [from memory]); anything longer goes through Number().
 */
function plainNumber(text: string, from: number, to: number): number | null {
  let i = from;
  let c = i < to ? text.charCodeAt(i) : -1;
  const negative = c === 45;
  if (c === 43 || c === 45) c = ++i < to ? text.charCodeAt(i) : -1;
  let digits = 0;
  let m = 0;
  let scale = 0;
  while (c >= 48 && c <= 57) {
    digits++;
    m = m * 10 + (c - 48);
    c = ++i < to ? text.charCodeAt(i) : -1;
  }
  if (c === 46) {
    c = ++i < to ? text.charCodeAt(i) : -1;
    while (c >= 48 && c <= 57) {
      digits++;
      scale--;
      m = m * 10 + (c - 48);
      c = ++i < to ? text.charCodeAt(i) : -1;
    }
  }
  if (digits === 0) return null;
  if (c === 101 || c === 69) {
    c = ++i < to ? text.charCodeAt(i) : -1;
    const negativeExponent = c === 45;
    if (c === 43 || c === 45) c = ++i < to ? text.charCodeAt(i) : -1;
    let e = 0;
    let exponent = 0;
    while (c >= 48 && c <= 57) {
      e++;
      if (exponent < 1000) exponent = exponent * 10 + (c - 48);
      c = ++i < to ? text.charCodeAt(i) : -1;
    }
    if (e === 0) return null;
    scale += negativeExponent ? -exponent : exponent;
  }
  if (i !== to) return null;
  if (digits <= 15 && scale >= -22 && scale <= 22) {
    const v = scale < 0 ? m / POW10[-scale]! : m * POW10[scale]!;
    return negative ? -v : v;
  }
  const v = Number(text.slice(from, to));
  return Number.isFinite(v) ? v : null;
}

/** 10⁰ … 10²², each an exact double. */
const POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

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
 * The output of a batch as UTF-8 bytes, appended as each job's JSON text is made. The texts then
 * die young instead of living in an array until one big join: the young-generation collector
 * copies every survivor, and 10⁴ texts of 0.7 kB each kept alive cost it measurably
 * (docs/benchmarks.md). The bytes are those of the joined string.
 */
class Utf8Output {
  private buf = Buffer.allocUnsafe(1 << 20);
  private length = 0;

  add(text: string): void {
    // A UTF-16 code unit takes at most 3 bytes in UTF-8.
    const need = this.length + 3 * text.length;
    if (need > this.buf.length) {
      const bigger = Buffer.allocUnsafe(Math.max(need, 2 * this.buf.length));
      this.buf.copy(bigger, 0, 0, this.length);
      this.buf = bigger;
    }
    this.length += this.buf.write(text, this.length, "utf8");
  }

  bytes(): Buffer {
    return this.buf.subarray(0, this.length);
  }
}

/** A batch's JSON array ("[\n" + texts joined by ",\n" + "\n]\n"), built text by text. */
function runBatch(work: Jobs, options: CommandOptions): Buffer {
  const out = new Utf8Output();
  out.add("[\n");
  const n = work.jobs.length;
  for (let k = 0; k < n; k++) {
    if (k > 0) out.add(",\n");
    out.add(
      work.command === "dose-response"
        ? JSON.stringify(doseResponseJobView(work.jobs[k]!, options))
        : JSON.stringify(mechanismJobView(work.jobs[k]!, options)),
    );
  }
  out.add("\n]\n");
  return out.bytes();
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
      const resolved = {
        ...options,
        response: auto ? responseFromHeader(text) : options.response,
        concentrationUnit: concentrationUnitFromHeader(text, command),
      };
      return { work: { command, jobs: doseJobs(text) }, options: resolved, batch: true, file };
    }
    const jobs = mechanismJobs(text);
    const resolved = { ...options, concentrationUnit: concentrationUnitFromHeader(text, command) };
    return { work: { command, jobs }, options: resolved, batch: jobs[0]?.compound !== null, file };
  } catch (e) {
    if (e instanceof TableInputError) throw new UsageError(`${file} ${e.message}`);
    throw e;
  }
}

/** The output of a prepared command; `threads` > 1 when workers were started and will share the batch. */
async function output(p: Prepared, threads: number, workers: Promise<string[] | null>[]): Promise<string | Buffer> {
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
  return runBatch(p.work, p.options);
}

/** Runs the command on argv (without node and script) and returns stdout; throws on bad input. */
export async function runAnalyze(argv: readonly string[], readFile: (path: string) => string): Promise<string> {
  const out = await output(prepare(argv, readFile), 1, []);
  return typeof out === "string" ? out : out.toString("utf8");
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
  // ANALYZE_TIMING=1: one stderr line with the phases, in ms since the process started (benchmarks).
  const marks: string[] = [];
  const mark = (phase: string) => {
    if (process.env.ANALYZE_TIMING === "1") marks.push(`${phase} ${Math.round(performance.now())}`);
  };
  try {
    mark("started");
    const prepared = prepare(argv, (p) => readFileSync(p, "utf8"));
    mark("read");
    const text = await output(prepared, threads, workers.results);
    mark("analysed");
    process.stdout.write(text);
    mark("written");
    if (marks.length > 0) process.stderr.write(`timing (ms since start): ${marks.join(", ")}\n`);
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
