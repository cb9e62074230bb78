/**
 * Parse a plate reader export (CSV, TSV or XLSX) into well readings, detecting its shape.
 *
 * Shapes:
 * - long-endpoint: a header row with `well` and `value` columns (names case-insensitive, other
 *   columns ignored, notes above the header allowed), one row per well;
 * - long-kinetic: the same plus a time column `time_s` (also `time (s)`, `time [s]`, `time_sec`;
 *   `time_min` is read as minutes), one row per well and read;
 * - grid-endpoint: one plate grid, a header row of column numbers 1..N and row letters A… down the
 *   column to its left (the grid may start in any column; notes around it are ignored);
 * - grid-kinetic: several grids, one per read, each with its read time above it (see read-time.ts).
 *   Several grids without times are refused (e.g. a two-wavelength endpoint export).
 * Blank cells in a grid are wells that were not read. Values may use a decimal comma when the
 * delimiter is not a comma (`0,25` in a semicolon or tab file).
 *
 * Limits: 25 MiB per file, 1536 wells, 500 reads. The plate format comes from the grid size, or
 * for long tables the smallest format holding every well; pass the plate map's format to have a
 * mismatch refused.
 */
import { formulaInjectionMessage, parseNumber } from "./cells";
import {
  formatForGrid,
  parseWellName,
  plateDimensions,
  type PlateFormat,
  rowIndexOfLabel,
  smallestFormatFor,
  fitsFormat,
  wellName,
  wellIndex,
} from "./geometry";
import { issue, type IssueLocation, MAX_ISSUES, type PlateIssue, quoteCell } from "./issues";
import { parseTimeLabel } from "./read-time";
import { decodeText, type Delimiter, looksBinary, readTextTable, sniffDelimiter, type TableRow } from "./text-table";
import { columnLetters, isOleCompound, isZip, readWorkbookRows } from "./xlsx";

export const MAX_FILE_BYTES = 25 * 1024 * 1024;
export const MAX_READS = 500;
export const MAX_WELLS = 1536;

export type ExportShape = "long-endpoint" | "long-kinetic" | "grid-endpoint" | "grid-kinetic";

export interface KineticPoint {
  readonly timeS: number;
  readonly value: number;
}

export interface ExportPreview {
  readonly source: string;
  readonly shape: ExportShape;
  readonly format: PlateFormat;
  readonly reads: number;
  readonly wells: number;
  readonly firstTimeS?: number;
  readonly lastTimeS?: number;
  readonly minValue: number;
  readonly maxValue: number;
  /** one sentence for the upload preview */
  readonly summary: string;
  /** the first few wells in plate order, for a glance at the numbers */
  readonly sample: readonly { readonly well: string; readonly value: number; readonly points?: number }[];
}

interface ExportBase {
  readonly fileName: string;
  readonly format: PlateFormat;
  readonly reads: number;
  readonly preview: ExportPreview;
}

export interface EndpointExport extends ExportBase {
  readonly shape: "long-endpoint" | "grid-endpoint";
  /** canonical well name → value, in plate order */
  readonly wells: Map<string, number>;
}

export interface KineticExport extends ExportBase {
  readonly shape: "long-kinetic" | "grid-kinetic";
  /** canonical well name → points sorted by time, in plate order */
  readonly wells: Map<string, KineticPoint[]>;
  /** every read time in the file, ascending */
  readonly timesS: readonly number[];
}

export type ReaderExport = EndpointExport | KineticExport;

/**
 * Largest magnitude accepted as a reading or a read time. Readers report counts, RFU or OD far
 * below this (a 32-bit counter stops near 4.3e9; common practice, from memory), and with readings
 * bounded here the means, SDs, spans and rates of 1536 wells stay finite, so QC and % inhibition
 * never meet Infinity or NaN. A value such as 1e308 parses as a finite double but overflows as
 * soon as it is squared or subtracted from its negative, so it is refused at parse.
 */
export const MAX_READING_MAGNITUDE = 1e12;
/** Read times in seconds: about 115 days, far beyond any kinetic read (chosen here). */
export const MAX_TIME_S = 1e7;

function outOfRange(raw: string, v: number, max: number, what: string): string | undefined {
  if (Number.isFinite(v) && Math.abs(v) <= max) return undefined;
  return `${raw.trim().length > 40 ? quoteCell(raw.trim()) : raw.trim()} is not a finite ${what} (the accepted range is ±${max.toExponential(0).replace("+", "")})`;
}

export type ReaderExportResult =
  { readonly ok: true; readonly export: ReaderExport } | { readonly ok: false; readonly issues: PlateIssue[] };

export interface ParseExportOptions {
  /** the plate map's format: a file for another plate size is refused */
  readonly format?: PlateFormat;
}

const MIB = 1024 * 1024;

function fail(fileName: string, message: string, where: Omit<IssueLocation, "file"> = {}): ReaderExportResult {
  return { ok: false, issues: [issue({ file: fileName, ...where }, message)] };
}

/**
 * Parse any supported export from its bytes and file name. XLSX is recognised by its zip
 * signature (or a .xlsx name), everything else is read as delimited text.
 */
export async function parseReaderExport(
  bytes: Uint8Array,
  fileName: string,
  options: ParseExportOptions = {},
): Promise<ReaderExportResult> {
  const pre = precheck(bytes, fileName);
  if (pre) return pre;
  if (isZip(bytes) || /\.xlsx$/i.test(fileName)) {
    if (!isZip(bytes)) return fail(fileName, "file is named .xlsx but is not an XLSX workbook");
    const wb = await readWorkbookRows(bytes);
    if (!wb.ok) return fail(fileName, wb.message);
    if (wb.rows.length === 0) return fail(fileName, "file is empty");
    return parseRows(
      wb.rows,
      { fileName, kind: "xlsx", decimalComma: false, source: `XLSX, sheet "${wb.sheet}"` },
      options,
    );
  }
  return parseTextBytes(bytes, fileName, options);
}

/** The synchronous path for CSV and TSV bytes (no XLSX). */
export function parseReaderExportText(
  input: string | Uint8Array,
  fileName: string,
  options: ParseExportOptions = {},
): ReaderExportResult {
  if (typeof input !== "string") {
    const pre = precheck(input, fileName);
    if (pre) return pre;
    if (isZip(input)) return fail(fileName, "file is an XLSX workbook; use parseReaderExport for workbooks");
    return parseTextBytes(input, fileName, options);
  }
  if (input.length > MAX_FILE_BYTES) return tooLarge(fileName, input.length);
  return parseText(input, fileName, options);
}

function tooLarge(fileName: string, size: number): ReaderExportResult {
  return fail(fileName, `file is ${(size / MIB).toFixed(1)} MB; the limit is ${MAX_FILE_BYTES / MIB} MB`);
}

function precheck(bytes: Uint8Array, fileName: string): ReaderExportResult | undefined {
  if (bytes.length > MAX_FILE_BYTES) return tooLarge(fileName, bytes.length);
  if (bytes.length === 0) return fail(fileName, "file is empty");
  if (isOleCompound(bytes)) return fail(fileName, "file is a legacy .xls workbook; save it as .xlsx or CSV");
  if (!isZip(bytes) && looksBinary(bytes)) {
    return fail(fileName, "file is not a CSV, TSV or XLSX export (it looks like binary data)");
  }
  return undefined;
}

function parseTextBytes(bytes: Uint8Array, fileName: string, options: ParseExportOptions): ReaderExportResult {
  return parseText(decodeText(bytes), fileName, options);
}

function parseText(text: string, fileName: string, options: ParseExportOptions): ReaderExportResult {
  if (text.trim() === "") return fail(fileName, "file is empty");
  const delimiter = sniffDelimiter(text, fileName);
  const table = readTextTable(text, delimiter);
  if (!table.ok) return fail(fileName, table.message, { line: table.line });
  const rows = table.rows;
  if (rows.length === 0) return fail(fileName, "file is empty");
  const source = delimiter === "\t" ? "TSV" : delimiter === ";" ? "CSV (semicolon-separated)" : "CSV";
  return parseRows(rows, { fileName, kind: "text", decimalComma: delimiter !== ",", source, delimiter }, options);
}

interface Ctx {
  readonly fileName: string;
  readonly kind: "text" | "xlsx";
  readonly decimalComma: boolean;
  readonly source: string;
  readonly delimiter?: Delimiter;
}

class Issues {
  readonly list: PlateIssue[] = [];
  constructor(private readonly ctx: Ctx) {}
  at(row: TableRow, col: number | undefined, well: string | undefined, message: string): void {
    if (this.list.length >= MAX_ISSUES) return;
    const where: { -readonly [K in keyof IssueLocation]: IssueLocation[K] } = { file: this.ctx.fileName };
    // XLSX problems are named by cell (`C7`), text problems by line.
    if (this.ctx.kind === "xlsx") where.cell = columnLetters(col ?? 0) + row.line;
    else where.line = row.line;
    if (well) where.well = well;
    this.list.push(issue(where, message));
  }
  get full(): boolean {
    return this.list.length >= MAX_ISSUES;
  }
}

const NO_DATA =
  'no plate data found: expected a header row "well,value" or "well,time_s,value", or a plate grid with column numbers 1–12, 1–24 or 1–48 across and row letters down';

function parseRows(rows: TableRow[], ctx: Ctx, options: ParseExportOptions): ReaderExportResult {
  const header = findLongHeader(rows);
  if (header) return parseLong(rows, header, ctx, options);
  return parseGrids(rows, ctx, options);
}

// ---------------------------------------------------------------- long tables

interface LongHeader {
  readonly rowIndex: number;
  readonly well: number;
  readonly value: number;
  readonly time?: { readonly col: number; readonly unitSeconds: number };
  readonly timeProblem?: { readonly col: number; readonly text: string };
}

function normalise(h: string): string {
  return h
    .trim()
    .toLowerCase()
    .replace(/[^a-z0-9]/g, "");
}

const TIME_COLUMNS: Record<string, number> = {
  times: 1,
  timesec: 1,
  timeseconds: 1,
  timems: 0.001,
  timemin: 60,
  timeminutes: 60,
};

/** A header naming `well` and `value` within the first 50 rows. */
function findLongHeader(rows: TableRow[]): LongHeader | undefined {
  for (let r = 0; r < Math.min(rows.length, 50); r++) {
    const names = rows[r]!.cells.map(normalise);
    const well = names.indexOf("well");
    const value = names.indexOf("value");
    if (well < 0 || value < 0) continue;
    let time: LongHeader["time"];
    let timeProblem: LongHeader["timeProblem"];
    names.forEach((n, col) => {
      const unit = TIME_COLUMNS[n];
      if (unit !== undefined && !time) time = { col, unitSeconds: unit };
      else if (n === "time" && !time) timeProblem = { col, text: rows[r]!.cells[col]!.trim() };
    });
    return { rowIndex: r, well, value, ...(time ? { time } : timeProblem ? { timeProblem } : {}) };
  }
  return undefined;
}

interface WellSeries {
  readonly times: number[];
  readonly values: number[];
  readonly lines: number[];
}

type WellLookup =
  | { readonly name: string; readonly idx: number; readonly row: number; readonly column: number }
  | { readonly error: string };

function parseLong(rows: TableRow[], h: LongHeader, ctx: Ctx, options: ParseExportOptions): ReaderExportResult {
  const issues = new Issues(ctx);
  const headerRow = rows[h.rowIndex]!;
  if (h.timeProblem) {
    issues.at(
      headerRow,
      h.timeProblem.col,
      undefined,
      `column ${quoteCell(h.timeProblem.text)} has no unit; name it time_s (seconds)`,
    );
    return { ok: false, issues: issues.list };
  }
  const time = h.time;
  const limitFormat: PlateFormat = options.format ?? 1536;
  const lineWord = ctx.kind === "xlsx" ? "row" : "line";
  // Wells are keyed by their 1536-grid index so the result comes out in plate order; a kinetic
  // file repeats each well name once per read, so names are looked up once.
  const lookup = new Map<string, WellLookup>();
  const endpoint = new Map<number, { value: number; line: number }>();
  const series = new Map<number, WellSeries>();
  const times = new Set<number>();
  let maxRow = 0;
  let maxCol = 0;
  for (let r = h.rowIndex + 1; r < rows.length && !issues.full; r++) {
    const row = rows[r]!;
    const rawWell = row.cells[h.well] ?? "";
    const rawValue = row.cells[h.value] ?? "";
    const rawTime = time ? (row.cells[time.col] ?? "") : "";
    const injWell = formulaInjectionMessage(rawWell);
    const injValue = formulaInjectionMessage(rawValue);
    const injTime = time ? formulaInjectionMessage(rawTime) : undefined;
    if (injWell) issues.at(row, h.well, undefined, injWell);
    if (injValue) issues.at(row, h.value, undefined, injValue);
    if (injTime && time) issues.at(row, time.col, undefined, injTime);
    if (injWell || injValue || injTime) continue;
    let found = lookup.get(rawWell);
    if (!found) {
      found = lookUpWell(rawWell, limitFormat);
      lookup.set(rawWell, found);
    }
    if ("error" in found) {
      issues.at(row, h.well, undefined, found.error);
      continue;
    }
    const { name, idx } = found;
    if (rawValue.trim() === "") {
      issues.at(row, h.value, name, "value is missing");
      continue;
    }
    const value = parseNumber(rawValue, ctx.decimalComma);
    if (value === undefined) {
      issues.at(row, h.value, name, `${quoteCell(rawValue.trim())} is not a number`);
      continue;
    }
    const valueRange = outOfRange(rawValue, value, MAX_READING_MAGNITUDE, "reading");
    if (valueRange) {
      issues.at(row, h.value, name, valueRange);
      continue;
    }
    if (found.row > maxRow) maxRow = found.row;
    if (found.column > maxCol) maxCol = found.column;
    if (!time) {
      const seen = endpoint.get(idx);
      if (seen) {
        issues.at(row, h.well, name, `well is listed twice (first on ${lineWord} ${seen.line})`);
        continue;
      }
      endpoint.set(idx, { value, line: row.line });
      continue;
    }
    if (rawTime.trim() === "") {
      issues.at(row, time.col, name, "time is missing");
      continue;
    }
    const t = parseNumber(rawTime, ctx.decimalComma);
    if (t === undefined) {
      issues.at(row, time.col, name, `time ${quoteCell(rawTime.trim())} is not a number`);
      continue;
    }
    if (t < 0) {
      issues.at(row, time.col, name, `time ${t} is negative`);
      continue;
    }
    const timeRange = outOfRange(rawTime, t * time.unitSeconds, MAX_TIME_S, "read time in seconds");
    if (timeRange) {
      issues.at(row, time.col, name, `time ${timeRange}`);
      continue;
    }
    const timeS = time.unitSeconds === 1 ? t : Math.round(t * time.unitSeconds * 1e9) / 1e9;
    let s = series.get(idx);
    if (!s) series.set(idx, (s = { times: [], values: [], lines: [] }));
    // Exports list reads in time order, so a later time needs no duplicate search.
    const last = s.times.length > 0 ? s.times[s.times.length - 1]! : -Infinity;
    if (timeS <= last) {
      const k = s.times.indexOf(timeS);
      if (k >= 0) {
        issues.at(
          row,
          h.well,
          name,
          `time ${timeS} s is listed twice for this well (first on ${lineWord} ${s.lines[k]})`,
        );
        continue;
      }
    }
    s.times.push(timeS);
    s.values.push(value);
    s.lines.push(row.line);
    if (!times.has(timeS)) {
      times.add(timeS);
      if (times.size > MAX_READS) {
        issues.at(
          row,
          time.col,
          name,
          `file has more than ${MAX_READS} reads (distinct times); the limit is ${MAX_READS}`,
        );
        break;
      }
    }
  }
  if (issues.list.length > 0) return { ok: false, issues: issues.list };
  const count = time ? series.size : endpoint.size;
  if (count === 0)
    return fail(ctx.fileName, "the table has a header but no wells", {
      ...(ctx.kind === "text" ? { line: headerRow.line } : {}),
    });
  const format = options.format ?? smallestFormatFor({ row: maxRow, column: maxCol })!;
  const nameOf = (k: number) => wellName({ row: Math.floor(k / 48), column: k % 48 });
  if (!time) {
    const keys = [...endpoint.keys()].sort((a, b) => a - b);
    const wells = new Map(keys.map((k) => [nameOf(k), endpoint.get(k)!.value]));
    return { ok: true, export: endpointExport("long-endpoint", ctx, format, wells) };
  }
  const keys = [...series.keys()].sort((a, b) => a - b);
  const wells = new Map<string, KineticPoint[]>();
  for (const k of keys) {
    const s = series.get(k)!;
    const pts: KineticPoint[] = s.times.map((timeS, i) => ({ timeS, value: s.values[i]! }));
    let sorted = true;
    for (let i = 1; i < pts.length; i++) if (pts[i]!.timeS < pts[i - 1]!.timeS) sorted = false;
    if (!sorted) pts.sort((a, b) => a.timeS - b.timeS);
    wells.set(nameOf(k), pts);
  }
  return {
    ok: true,
    export: kineticExport(
      "long-kinetic",
      ctx,
      format,
      wells,
      [...times].sort((a, b) => a - b),
    ),
  };
}

function lookUpWell(rawWell: string, format: PlateFormat): WellLookup {
  if (rawWell.trim() === "") return { error: "well is missing" };
  const pos = parseWellName(rawWell);
  if (!pos) return { error: `${quoteCell(rawWell.trim())} is not a well name` };
  if (!fitsFormat(pos, format))
    return { error: `${quoteCell(rawWell.trim())} is not a well of a ${format}-well plate` };
  return { name: wellName(pos), idx: wellIndex(pos, 1536), row: pos.row, column: pos.column };
}

// ---------------------------------------------------------------- plate grids

interface GridBlock {
  readonly headerIndex: number;
  /** column of the row letters; numbers start one to the right */
  readonly labelCol: number;
  readonly columns: number;
  readonly rows: number;
  readonly timeS?: number;
  readonly badTime?: string;
}

/** Position of a 1, 2, …, N run (N ≥ 2) in a row, or undefined. */
function columnHeader(cells: readonly string[]): { start: number; n: number } | undefined {
  for (let j = 1; j < cells.length; j++) {
    if (cells[j]!.trim() !== "1") continue;
    let n = 1;
    while (j + n < cells.length && cells[j + n]!.trim() === String(n + 1)) n++;
    if (n >= 2) return { start: j, n };
  }
  return undefined;
}

function findBlocks(rows: TableRow[]): GridBlock[] {
  const blocks: GridBlock[] = [];
  let prevEnd = -1;
  for (let r = 0; r < rows.length; r++) {
    const head = columnHeader(rows[r]!.cells);
    if (!head) continue;
    const labelCol = head.start - 1;
    let count = 0;
    while (r + 1 + count < rows.length) {
      const label = rows[r + 1 + count]!.cells[labelCol] ?? "";
      if (rowIndexOfLabel(label) !== count) break;
      count++;
    }
    if (count === 0) continue;
    // Read time: the header's corner cell, else the nearest line above that reads as a time.
    let timeS: number | undefined;
    let badTime: string | undefined;
    const corner = parseTimeLabel([rows[r]!.cells[labelCol] ?? ""], true);
    if (corner.kind === "time") timeS = corner.seconds;
    for (let up = r - 1; timeS === undefined && up > prevEnd; up--) {
      const t = parseTimeLabel(rows[up]!.cells, up === r - 1);
      if (t.kind === "time") timeS = t.seconds;
      else if (t.kind === "bad" && badTime === undefined) badTime = t.text;
    }
    blocks.push({
      headerIndex: r,
      labelCol,
      columns: head.n,
      rows: count,
      ...(timeS !== undefined ? { timeS } : {}),
      ...(badTime !== undefined ? { badTime } : {}),
    });
    prevEnd = r + count;
    r = prevEnd;
    if (blocks.length > MAX_READS) break;
  }
  return blocks;
}

function parseGrids(rows: TableRow[], ctx: Ctx, options: ParseExportOptions): ReaderExportResult {
  const blocks = findBlocks(rows);
  if (blocks.length === 0) return fail(ctx.fileName, NO_DATA);
  const issues = new Issues(ctx);
  const first = blocks[0]!;
  const firstHeader = rows[first.headerIndex]!;
  if (blocks.length > MAX_READS) {
    issues.at(
      firstHeader,
      first.labelCol,
      undefined,
      `file has more than ${MAX_READS} plate grids (reads); the limit is ${MAX_READS}`,
    );
    return { ok: false, issues: issues.list };
  }
  for (const b of blocks) {
    const hr = rows[b.headerIndex]!;
    const format = formatForGrid(b.rows, b.columns);
    if (format === undefined) {
      issues.at(
        hr,
        b.labelCol,
        undefined,
        `plate grid has ${b.rows} rows × ${b.columns} columns; a plate has 8 × 12, 16 × 24 or 32 × 48`,
      );
    } else if (options.format !== undefined && format !== options.format) {
      const d = plateDimensions(options.format);
      issues.at(
        hr,
        b.labelCol,
        undefined,
        `plate grid is ${b.rows} × ${b.columns} (${format}-well) but the plate map is ${options.format}-well (${d.rows} × ${d.columns})`,
      );
    } else if (b.rows !== first.rows || b.columns !== first.columns) {
      issues.at(
        hr,
        b.labelCol,
        undefined,
        `plate grid is ${b.rows} × ${b.columns} but the first grid is ${first.rows} × ${first.columns}`,
      );
    }
  }
  if (issues.list.length > 0) return { ok: false, issues: issues.list };
  const format = formatForGrid(first.rows, first.columns)!;
  const kinetic = blocks.length > 1;
  if (kinetic) {
    const seenTimes = new Map<number, number>();
    for (const b of blocks) {
      const hr = rows[b.headerIndex]!;
      if (b.timeS === undefined) {
        const hint = b.badTime !== undefined ? `${quoteCell(b.badTime)} is not a read time` : "no read time above it";
        issues.at(
          hr,
          b.labelCol,
          undefined,
          `file has ${blocks.length} plate grids, and this one has ${hint}; write e.g. "Time (s): 30" on the line above each grid`,
        );
        continue;
      }
      const prev = seenTimes.get(b.timeS);
      if (prev !== undefined)
        issues.at(
          hr,
          b.labelCol,
          undefined,
          `read time ${b.timeS} s appears twice (first at the grid on ${ctx.kind === "xlsx" ? "row" : "line"} ${prev})`,
        );
      else seenTimes.set(b.timeS, hr.line);
    }
    if (issues.list.length > 0) return { ok: false, issues: issues.list };
  }
  const d = plateDimensions(format);
  const values: (KineticPoint[] | undefined)[] = new Array(format);
  const endpoint: (number | undefined)[] = new Array(format);
  for (const b of blocks) {
    for (let rr = 0; rr < b.rows && !issues.full; rr++) {
      const row = rows[b.headerIndex + 1 + rr]!;
      for (let c = 0; c < d.columns; c++) {
        const col = b.labelCol + 1 + c;
        const raw = row.cells[col];
        if (raw === undefined || raw.trim() === "") continue;
        const well = wellName({ row: rr, column: c });
        const inj = formulaInjectionMessage(raw);
        if (inj) {
          issues.at(row, col, well, inj);
          continue;
        }
        const v = parseNumber(raw, ctx.decimalComma);
        if (v === undefined) {
          issues.at(row, col, well, `${quoteCell(raw.trim())} is not a number`);
          continue;
        }
        const range = outOfRange(raw, v, MAX_READING_MAGNITUDE, "reading");
        if (range) {
          issues.at(row, col, well, range);
          continue;
        }
        const idx = rr * d.columns + c;
        if (kinetic) (values[idx] ??= []).push({ timeS: b.timeS!, value: v });
        else endpoint[idx] = v;
      }
    }
  }
  if (issues.list.length > 0) return { ok: false, issues: issues.list };
  if (!kinetic) {
    const wells = new Map<string, number>();
    endpoint.forEach((v, i) => {
      if (v !== undefined) wells.set(wellName({ row: Math.floor(i / d.columns), column: i % d.columns }), v);
    });
    if (wells.size === 0) return fail(ctx.fileName, "the plate grid has no values");
    return { ok: true, export: endpointExport("grid-endpoint", ctx, format, wells) };
  }
  const wells = new Map<string, KineticPoint[]>();
  values.forEach((pts, i) => {
    if (pts)
      wells.set(
        wellName({ row: Math.floor(i / d.columns), column: i % d.columns }),
        pts.sort((a, b) => a.timeS - b.timeS),
      );
  });
  if (wells.size === 0) return fail(ctx.fileName, "the plate grids have no values");
  const times = blocks.map((b) => b.timeS!).sort((a, b) => a - b);
  return { ok: true, export: kineticExport("grid-kinetic", ctx, format, wells, times) };
}

// ---------------------------------------------------------------- results and preview

const SHAPE_WORDS: Record<ExportShape, string> = {
  "long-endpoint": "long table, endpoint",
  "long-kinetic": "long table, kinetic",
  "grid-endpoint": "plate grid, endpoint",
  "grid-kinetic": "plate grids, kinetic",
};

function fmt(x: number): string {
  return Number(x.toPrecision(6)).toString();
}

function endpointExport(
  shape: EndpointExport["shape"],
  ctx: Ctx,
  format: PlateFormat,
  wells: Map<string, number>,
): EndpointExport {
  let min = Infinity;
  let max = -Infinity;
  for (const v of wells.values()) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const preview: ExportPreview = {
    source: ctx.source,
    shape,
    format,
    reads: 1,
    wells: wells.size,
    minValue: min,
    maxValue: max,
    summary: `${ctx.source}, ${SHAPE_WORDS[shape]}: ${format}-well plate, ${wells.size} wells, 1 read, values ${fmt(min)} to ${fmt(max)}`,
    sample: [...wells.entries()].slice(0, 5).map(([well, value]) => ({ well, value })),
  };
  return { fileName: ctx.fileName, shape, format, reads: 1, wells, preview };
}

function kineticExport(
  shape: KineticExport["shape"],
  ctx: Ctx,
  format: PlateFormat,
  wells: Map<string, KineticPoint[]>,
  timesS: number[],
): KineticExport {
  let min = Infinity;
  let max = -Infinity;
  for (const pts of wells.values()) {
    for (const p of pts) {
      if (p.value < min) min = p.value;
      if (p.value > max) max = p.value;
    }
  }
  const firstTimeS = timesS[0]!;
  const lastTimeS = timesS[timesS.length - 1]!;
  const preview: ExportPreview = {
    source: ctx.source,
    shape,
    format,
    reads: timesS.length,
    wells: wells.size,
    firstTimeS,
    lastTimeS,
    minValue: min,
    maxValue: max,
    summary: `${ctx.source}, ${SHAPE_WORDS[shape]}: ${format}-well plate, ${wells.size} wells, ${timesS.length} reads from ${fmt(firstTimeS)} s to ${fmt(lastTimeS)} s, values ${fmt(min)} to ${fmt(max)}`,
    sample: [...wells.entries()].slice(0, 5).map(([well, pts]) => ({ well, value: pts[0]!.value, points: pts.length })),
  };
  return { fileName: ctx.fileName, shape, format, reads: timesS.length, wells, timesS, preview };
}
