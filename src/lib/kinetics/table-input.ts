/**
 * Reading the two tabular inputs of the engine from CSV text — a substrate × inhibitor rate
 * matrix and dose-response series — with errors that name the line and the column, so a user
 * can fix the file. Pure string processing (no I/O): the command-line tool and upload handlers
 * both use it.
 *
 * CSV: comma-separated, read by the one CSV reader (src/lib/csv/read.ts: RFC 4180 quotes, CRLF or
 * LF, UTF-8 BOM ignored, blank lines skipped). Headers are matched case-insensitively after
 * trimming; a unit in parentheses or brackets is allowed ("substrate (µM)"), and when both
 * concentration columns carry a unit it must be the same one.
 */
import { CsvSyntaxError, forEachCsvRow, readCsv, type CsvRow, type CsvRowCursor } from "@/lib/csv/read";
import type { MechanismPoint } from "./mechanism-fit";
import { mechanismDataProblem } from "./mechanism-fit";

/** An input problem located in the file (1-based line; column header name or null). */
export class TableInputError extends Error {
  constructor(
    readonly line: number,
    readonly column: string | null,
    readonly detail: string,
  ) {
    super(`line ${line}${column ? `, column "${column}"` : ""}: ${detail}`);
    this.name = "TableInputError";
  }
}

/** Splits CSV text into rows of cells, keeping each row's 1-based line number. */
export function parseCsv(text: string): CsvRow[] {
  return located(() => readCsv(text));
}

/** The reader's syntax errors (an unclosed quote) as this module's located errors. */
function located<T>(read: () => T): T {
  try {
    return read();
  } catch (e) {
    if (e instanceof CsvSyntaxError) throw new TableInputError(e.line, null, e.detail);
    throw e;
  }
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function headerKey(raw: string): { name: string; unit: string | null } {
  const t = raw.trim();
  const m = /^(.*?)\s*[([]\s*([^)\]]*?)\s*[)\]]\s*$/.exec(t);
  if (m) return { name: m[1]!.trim().toLowerCase(), unit: m[2]! };
  return { name: t.toLowerCase(), unit: null };
}

/**
 * Calls `onHeader` with the first non-blank row and `onRow` with every later non-blank row,
 * through the reader's cursor (batch files have 10⁵ rows: no array per row).
 */
function forEachRow(
  text: string,
  onHeader: (cells: string[], line: number) => void,
  onRow: (row: CsvRowCursor) => void,
): void {
  let seenHeader = false;
  located(() =>
    forEachCsvRow(text, (row) => {
      if (seenHeader) return onRow(row);
      seenHeader = true;
      onHeader(row.cells(), row.line);
    }),
  );
}

interface Columns {
  headerLine: number;
  headerCount: number;
  index: Record<string, number>;
  units: Record<string, string | null>;
}

function matchHeader(cells: string[], line: number, required: readonly string[]): Columns {
  const index: Record<string, number> = {};
  const units: Record<string, string | null> = {};
  cells.forEach((raw, k) => {
    const { name, unit } = headerKey(raw);
    if (required.includes(name)) {
      if (index[name] !== undefined) throw new TableInputError(line, name, "this column appears twice");
      index[name] = k;
      units[name] = unit;
    }
  });
  for (const name of required) {
    if (index[name] === undefined) {
      const found =
        cells
          .map((c) => c.trim())
          .filter(Boolean)
          .join(", ") || "nothing";
      throw new TableInputError(line, name, `missing column (expected ${required.join(", ")}; found ${found})`);
    }
  }
  return { headerLine: line, headerCount: cells.length, index, units };
}

/** Reads the header and hands each checked data row to `onRow`. Returns the columns and the
 * last data line. */
function readTable(
  text: string,
  required: readonly string[],
  onRow: (row: CsvRowCursor, cols: Columns) => void,
): { cols: Columns; lastLine: number } {
  let cols: Columns | null = null;
  let lastLine = 0;
  forEachRow(
    text,
    (cells, line) => {
      cols = matchHeader(cells, line, required);
    },
    (row) => {
      const c = cols!;
      if (row.count !== c.headerCount)
        throw new TableInputError(row.line, null, `${row.count} cells, but the header has ${c.headerCount}`);
      lastLine = row.line;
      onRow(row, c);
    },
  );
  if (cols === null)
    throw new TableInputError(1, null, `the file is empty; expected a header with columns ${required.join(", ")}`);
  const found: Columns = cols;
  if (lastLine === 0) throw new TableInputError(found.headerLine + 1, null, "no data rows after the header");
  return { cols: found, lastLine };
}

function numberCell(row: CsvRowCursor, cols: Columns, column: string, kind: "concentration" | "value"): number {
  return numberAt(row, cols.index[column]!, column, kind);
}

function numberAt(row: CsvRowCursor, index: number, column: string, kind: "concentration" | "value"): number {
  let raw = row.cell(index);
  const last = raw.length - 1;
  if (last >= 0 && (raw.charCodeAt(0) <= 32 || raw.charCodeAt(last) <= 32)) raw = raw.trim();
  const v = Number(raw);
  // Number() alone would accept "", "0x1f", "Infinity" and " 1 "; the pattern admits decimals only.
  if (raw === "" || !Number.isFinite(v) || !NUMBER.test(raw)) {
    if (raw === "") throw new TableInputError(row.line, column, "empty cell; a number is needed");
    if (!NUMBER.test(raw)) throw new TableInputError(row.line, column, `"${raw}" is not a number`);
    throw new TableInputError(row.line, column, `"${raw}" is out of range`);
  }
  if (kind === "concentration" && v < 0) throw new TableInputError(row.line, column, `negative concentration ${raw}`);
  return v;
}

/** Reads `substrate,inhibitor,rate` rows (any column order; other columns ignored). Each point
 * keeps its file line, for messages about it. */
export function readMechanismCsv(text: string): (MechanismPoint & { line: number })[] {
  const points: (MechanismPoint & { line: number })[] = [];
  const { cols, lastLine } = readTable(text, ["substrate", "inhibitor", "rate"], (row, c) => {
    points.push({
      substrate: numberCell(row, c, "substrate", "concentration"),
      inhibitor: numberCell(row, c, "inhibitor", "concentration"),
      rate: numberCell(row, c, "rate", "value"),
      line: row.line,
    });
  });
  const { substrate, inhibitor } = cols.units;
  if (substrate && inhibitor && substrate !== inhibitor) {
    throw new TableInputError(
      cols.headerLine,
      "inhibitor",
      `unit "${inhibitor}" differs from the substrate's "${substrate}"; use one concentration unit`,
    );
  }
  const problem = mechanismDataProblem(points);
  if (problem) {
    const column = /inhibitor/.test(problem) ? "inhibitor" : /substrate/.test(problem) ? "substrate" : "rate";
    throw new TableInputError(lastLine, column, `too few points: ${problem}`);
  }
  return points;
}

export interface DoseResponseSeries {
  compound: string;
  concentration: number[];
  response: number[];
  /** File line of each point. */
  lines: number[];
}

/** Smallest series the 4PL accepts with all four parameters free. */
export const MIN_DOSE_RESPONSE_POINTS = 5;
export const MIN_DOSE_RESPONSE_CONCENTRATIONS = 4;

/**
 * Reads `compound,concentration,response` rows into one series per compound, in order of first
 * appearance. `minPoints`/`minConcentrations` default to what a 4-parameter fit needs.
 */
export function readDoseResponseCsv(
  text: string,
  minPoints = MIN_DOSE_RESPONSE_POINTS,
  minConcentrations = MIN_DOSE_RESPONSE_CONCENTRATIONS,
): DoseResponseSeries[] {
  const byName = new Map<string, DoseResponseSeries>();
  let current: DoseResponseSeries | null = null;
  let ci = -1;
  let xi = -1;
  let yi = -1;
  readTable(text, ["compound", "concentration", "response"], (row, c) => {
    if (ci < 0) {
      ci = c.index.compound!;
      xi = c.index.concentration!;
      yi = c.index.response!;
    }
    const compound = row.cell(ci).trim();
    if (compound === "") throw new TableInputError(row.line, "compound", "empty compound name");
    const concentration = numberAt(row, xi, "concentration", "concentration");
    const response = numberAt(row, yi, "response", "value");
    // Rows of one compound are usually consecutive: skip the map lookup then.
    let s = current !== null && current.compound === compound ? current : byName.get(compound);
    if (!s) {
      s = { compound, concentration: [], response: [], lines: [] };
      byName.set(compound, s);
    }
    current = s;
    s.concentration.push(concentration);
    s.response.push(response);
    s.lines.push(row.line);
  });
  const series = [...byName.values()];
  for (const s of series) {
    const last = s.lines[s.lines.length - 1]!;
    if (s.concentration.length < minPoints) {
      throw new TableInputError(
        last,
        "concentration",
        `too few points: compound "${s.compound}" has ${s.concentration.length}; at least ${minPoints} are needed`,
      );
    }
    const distinct = distinctCount(s.concentration);
    if (distinct < minConcentrations) {
      throw new TableInputError(
        last,
        "concentration",
        `too few points: compound "${s.compound}" has ${distinct} distinct concentrations; at least ${minConcentrations} are needed`,
      );
    }
  }
  return series;
}

/** Distinct values of a short series without allocating (a Set per compound adds up in batches). */
function distinctCount(values: readonly number[]): number {
  if (values.length > 64) return new Set(values).size;
  let count = 0;
  for (let i = 0; i < values.length; i++) {
    let seen = false;
    for (let j = 0; j < i && !seen; j++) seen = values[j] === values[i];
    if (!seen) count++;
  }
  return count;
}
