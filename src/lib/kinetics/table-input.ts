/**
 * Reading the two tabular inputs of the engine from CSV text — a substrate × inhibitor rate
 * matrix and dose-response series — with errors that name the line and the column, so a user
 * can fix the file. Pure string processing (no I/O): the command-line tool and upload handlers
 * both use it.
 *
 * CSV: comma-separated, optional double quotes ("" escapes a quote), CRLF or LF, UTF-8 BOM
 * ignored, blank lines skipped (RFC 4180 subset). Headers are matched case-insensitively after
 * trimming; a unit in parentheses or brackets is allowed ("substrate (µM)"), and when both
 * concentration columns carry a unit it must be the same one.
 */
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

interface CsvRow {
  line: number;
  cells: string[];
}

/** Splits CSV text into rows of cells, keeping each row's 1-based line number. */
export function parseCsv(text: string): CsvRow[] {
  const rows: CsvRow[] = [];
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;
  const n = text.length;
  while (i < n) {
    const startLine = line;
    const cells: string[] = [];
    let cell = "";
    let quoted = false;
    let rowDone = false;
    while (i < n && !rowDone) {
      const ch = text[i]!;
      if (quoted) {
        if (ch === '"') {
          if (text[i + 1] === '"') {
            cell += '"';
            i += 2;
          } else {
            quoted = false;
            i++;
          }
        } else {
          if (ch === "\n") line++;
          cell += ch;
          i++;
        }
      } else if (ch === '"' && cell.trim() === "") {
        quoted = true;
        cell = "";
        i++;
      } else if (ch === ",") {
        cells.push(cell);
        cell = "";
        i++;
      } else if (ch === "\n" || ch === "\r") {
        if (ch === "\r" && text[i + 1] === "\n") i++;
        i++;
        line++;
        rowDone = true;
      } else {
        cell += ch;
        i++;
      }
    }
    if (quoted) throw new TableInputError(startLine, null, "a quoted cell is not closed");
    cells.push(cell);
    if (cells.length === 1 && cells[0]!.trim() === "") continue; // blank line
    rows.push({ line: startLine, cells });
  }
  return rows;
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function headerKey(raw: string): { name: string; unit: string | null } {
  const t = raw.trim();
  const m = /^(.*?)\s*[([]\s*([^)\]]*?)\s*[)\]]\s*$/.exec(t);
  if (m) return { name: m[1]!.trim().toLowerCase(), unit: m[2]! };
  return { name: t.toLowerCase(), unit: null };
}

interface Located {
  header: CsvRow;
  data: CsvRow[];
  index: Record<string, number>;
  units: Record<string, string | null>;
}

function locateColumns(text: string, required: readonly string[]): Located {
  const rows = parseCsv(text);
  const header = rows[0];
  if (!header) throw new TableInputError(1, null, `the file is empty; expected a header with columns ${required.join(", ")}`);
  const index: Record<string, number> = {};
  const units: Record<string, string | null> = {};
  header.cells.forEach((raw, k) => {
    const { name, unit } = headerKey(raw);
    if (required.includes(name)) {
      if (index[name] !== undefined) throw new TableInputError(header.line, name, "this column appears twice");
      index[name] = k;
      units[name] = unit;
    }
  });
  for (const name of required) {
    if (index[name] === undefined) {
      const found = header.cells.map((c) => c.trim()).filter(Boolean).join(", ") || "nothing";
      throw new TableInputError(header.line, name, `missing column (expected ${required.join(", ")}; found ${found})`);
    }
  }
  const data = rows.slice(1);
  for (const row of data) {
    if (row.cells.length !== header.cells.length) {
      throw new TableInputError(row.line, null, `${row.cells.length} cells, but the header has ${header.cells.length}`);
    }
  }
  if (data.length === 0) throw new TableInputError(header.line + 1, null, "no data rows after the header");
  return { header, data, index, units };
}

function numberCell(row: CsvRow, index: Record<string, number>, column: string, kind: "concentration" | "value"): number {
  const raw = row.cells[index[column]!]!.trim();
  if (raw === "") throw new TableInputError(row.line, column, "empty cell; a number is needed");
  if (!NUMBER.test(raw)) throw new TableInputError(row.line, column, `"${raw}" is not a number`);
  const v = Number(raw);
  if (!Number.isFinite(v)) throw new TableInputError(row.line, column, `"${raw}" is out of range`);
  if (kind === "concentration" && v < 0) throw new TableInputError(row.line, column, `negative concentration ${raw}`);
  return v;
}

/** Reads `substrate,inhibitor,rate` rows (any column order; other columns ignored). */
export function readMechanismCsv(text: string): MechanismPoint[] {
  const { header, data, index, units } = locateColumns(text, ["substrate", "inhibitor", "rate"]);
  if (units.substrate && units.inhibitor && units.substrate !== units.inhibitor) {
    throw new TableInputError(header.line, "inhibitor", `unit "${units.inhibitor}" differs from the substrate's "${units.substrate}"; use one concentration unit`);
  }
  const points = data.map((row) => ({
    substrate: numberCell(row, index, "substrate", "concentration"),
    inhibitor: numberCell(row, index, "inhibitor", "concentration"),
    rate: numberCell(row, index, "rate", "value"),
  }));
  const problem = mechanismDataProblem(points);
  if (problem) {
    const last = data[data.length - 1]!.line;
    const column = /inhibitor/.test(problem) ? "inhibitor" : /substrate/.test(problem) ? "substrate" : "rate";
    throw new TableInputError(last, column, `too few points: ${problem}`);
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
export function readDoseResponseCsv(text: string, minPoints = MIN_DOSE_RESPONSE_POINTS, minConcentrations = MIN_DOSE_RESPONSE_CONCENTRATIONS): DoseResponseSeries[] {
  const { data, index } = locateColumns(text, ["compound", "concentration", "response"]);
  const byName = new Map<string, DoseResponseSeries>();
  for (const row of data) {
    const compound = row.cells[index.compound!]!.trim();
    if (compound === "") throw new TableInputError(row.line, "compound", "empty compound name");
    const concentration = numberCell(row, index, "concentration", "concentration");
    const response = numberCell(row, index, "response", "value");
    let s = byName.get(compound);
    if (!s) {
      s = { compound, concentration: [], response: [], lines: [] };
      byName.set(compound, s);
    }
    s.concentration.push(concentration);
    s.response.push(response);
    s.lines.push(row.line);
  }
  const series = [...byName.values()];
  for (const s of series) {
    const last = s.lines[s.lines.length - 1]!;
    if (s.concentration.length < minPoints) {
      throw new TableInputError(last, "concentration", `too few points: compound "${s.compound}" has ${s.concentration.length}; at least ${minPoints} are needed`);
    }
    const distinct = new Set(s.concentration).size;
    if (distinct < minConcentrations) {
      throw new TableInputError(last, "concentration", `too few points: compound "${s.compound}" has ${distinct} distinct concentrations; at least ${minConcentrations} are needed`);
    }
  }
  return series;
}
