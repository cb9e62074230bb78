/**
 * The one CSV reader: text → rows of raw (untrimmed) cells, each row with the 1-based line of the
 * file where it starts, so every message about a row can name its line.
 *
 * RFC 4180 (Shafranovich, "Common Format and MIME Type for CSV Files", 2005), read leniently as
 * spreadsheets and plate readers write it:
 * - a field in double quotes may hold the delimiter, line breaks and doubled quotes (`""` → `"`);
 *   spaces or tabs before the opening quote are dropped, text after the closing quote is kept;
 * - a quote inside an unquoted field is an ordinary character;
 * - records end with CRLF, LF or a lone CR; a UTF-8 byte order mark at the start is ignored;
 * - a line with nothing but spaces is skipped; `skipBlankRows` also skips rows whose cells are all
 *   blank (`,,,` lines between the blocks of a plate reader export);
 * - a quote that is never closed is an error naming the line where it opened.
 * The delimiter is an option (comma by default); choosing it (sniffing) is the caller's business.
 *
 * Files without quotes or lone CRs (the 10⁵-row batch files of the kinetics engine) take a
 * single pass that records cell boundaries with native `indexOf` instead of scanning characters.
 */

export interface CsvRow {
  /** 1-based line where the record starts. */
  readonly line: number;
  readonly cells: string[];
}

/** One record seen by `forEachCsvRow`; valid only during the callback (it is reused). */
export interface CsvRowCursor {
  /** 1-based line where the record starts. */
  readonly line: number;
  /** Number of cells. */
  readonly count: number;
  /** Cell `k` (0 ≤ k < count), raw. */
  cell(k: number): string;
  /** All cells as a new array. */
  cells(): string[];
}

export interface CsvReadOptions {
  /** One character between fields (default ","). */
  readonly delimiter?: string;
  /** Also skip rows whose cells are all blank (default false: only lines of spaces are skipped). */
  readonly skipBlankRows?: boolean;
}

/** What is wrong with the text as CSV, and where (1-based line). */
export class CsvSyntaxError extends Error {
  constructor(
    readonly line: number,
    readonly detail: string,
  ) {
    super(`line ${line}: ${detail}`);
    this.name = "CsvSyntaxError";
  }
}

export const UNCLOSED_QUOTE = "a quoted cell is not closed";

const LF = 10;
const CR = 13;
const QUOTE = 34;
const SPACE = 32;
const TAB = 9;

const isBlank = (s: string): boolean => s.length === 0 || s.trim() === "";

function delimiterOf(options: CsvReadOptions): string {
  const d = options.delimiter ?? ",";
  if (d.length !== 1 || d === '"' || d === "\n" || d === "\r")
    throw new RangeError(
      `CSV delimiter must be one character other than a quote or a line break, got ${JSON.stringify(d)}`,
    );
  return d;
}

const stripBom = (text: string): string => (text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
const needsTokenizer = (body: string): boolean => body.includes('"') || /\r(?!\n)/.test(body);

/**
 * Every record in file order, through a reused cursor (no array per row on the fast path). A
 * syntax error (CsvSyntaxError) is thrown before the first record is handed over.
 */
export function forEachCsvRow(text: string, onRow: (row: CsvRowCursor) => void, options: CsvReadOptions = {}): void {
  const delimiter = delimiterOf(options);
  const body = stripBom(text);
  const skipBlankRows = options.skipBlankRows ?? false;
  if (!needsTokenizer(body)) return scanUnquoted(body, delimiter, skipBlankRows, onRow);
  let cells: string[] = [];
  const cursor = { line: 0, count: 0, cell: (k: number) => cells[k]!, cells: () => cells.slice() };
  for (const row of quotedRows(body, delimiter, skipBlankRows)) {
    cells = row.cells;
    cursor.line = row.line;
    cursor.count = cells.length;
    onRow(cursor);
  }
}

/** Every record as `{ line, cells }`. */
export function readCsv(text: string, options: CsvReadOptions = {}): CsvRow[] {
  const delimiter = delimiterOf(options);
  const body = stripBom(text);
  const skipBlankRows = options.skipBlankRows ?? false;
  if (needsTokenizer(body)) return quotedRows(body, delimiter, skipBlankRows);
  const rows: CsvRow[] = [];
  scanUnquoted(body, delimiter, skipBlankRows, (row) => rows.push({ line: row.line, cells: row.cells() }));
  return rows;
}

/** The tokenizer's records without the blank ones; the whole text is read before any is returned. */
function quotedRows(body: string, delimiter: string, skipBlankRows: boolean): CsvRow[] {
  const rows: CsvRow[] = [];
  tokenizeQuoted(body, delimiter.charCodeAt(0), (line, cells) => {
    if (skipBlankRows ? cells.every(isBlank) : cells.length === 1 && isBlank(cells[0]!)) return;
    rows.push({ line, cells });
  });
  return rows;
}

/**
 * The RFC 4180 tokenizer for text with quotes (or lone CRs): hands each record, blank ones too,
 * to `emit` with the line where it starts.
 */
function tokenizeQuoted(text: string, delim: number, emit: (line: number, cells: string[]) => void): void {
  const n = text.length;
  let i = 0;
  let line = 1;
  // End of an unquoted run: the next delimiter or line break.
  const runEnd = (from: number): number => {
    let e = from;
    while (e < n) {
      const c = text.charCodeAt(e);
      if (c === delim || c === LF || c === CR) break;
      e++;
    }
    return e;
  };
  while (i < n) {
    const rowLine = line;
    const cells: string[] = [];
    for (;;) {
      let j = i;
      while (j < n) {
        const c = text.charCodeAt(j);
        if ((c === SPACE || c === TAB) && c !== delim) j++;
        else break;
      }
      if (j < n && text.charCodeAt(j) === QUOTE) {
        const openLine = line;
        let field = "";
        let k = j + 1;
        for (;;) {
          const q = text.indexOf('"', k);
          if (q === -1) throw new CsvSyntaxError(openLine, UNCLOSED_QUOTE);
          field += text.slice(k, q);
          line += lineBreaks(text, k, q);
          if (text.charCodeAt(q + 1) === QUOTE) {
            field += '"';
            k = q + 2;
          } else {
            k = q + 1;
            break;
          }
        }
        const e = runEnd(k);
        cells.push(e > k ? field + text.slice(k, e) : field);
        i = e;
      } else {
        const e = runEnd(i);
        cells.push(text.slice(i, e));
        i = e;
      }
      if (i < n && text.charCodeAt(i) === delim) {
        i++;
        continue;
      }
      if (i < n) {
        if (text.charCodeAt(i) === CR && text.charCodeAt(i + 1) === LF) i++;
        i++;
        line++;
      }
      break;
    }
    emit(rowLine, cells);
  }
}

/** Line breaks (CRLF, LF or a lone CR) inside a quoted field, between `from` and `to`. */
function lineBreaks(text: string, from: number, to: number): number {
  let count = 0;
  for (let p = from; p < to; p++) {
    const c = text.charCodeAt(p);
    if (c === LF || (c === CR && text.charCodeAt(p + 1) !== LF)) count++;
  }
  return count;
}

/** The fast path: no quotes and no lone CR, so every line is one record split at the delimiter. */
function scanUnquoted(
  body: string,
  delimiter: string,
  skipBlankRows: boolean,
  onRow: (row: CsvRowCursor) => void,
): void {
  const len = body.length;
  let starts: Int32Array = new Int32Array(16);
  let ends: Int32Array = new Int32Array(16);
  let count = 0;
  const cell = (k: number) => body.slice(starts[k]!, ends[k]!);
  const cursor = {
    line: 0,
    count: 0,
    cell,
    cells: () => {
      const out: string[] = new Array(count);
      for (let k = 0; k < count; k++) out[k] = cell(k);
      return out;
    },
  };
  let pos = 0;
  let line = 0;
  // The next delimiter at or after the search point (-1: none left); kept across lines so a file
  // with few delimiters is still scanned once.
  let next = -2;
  while (pos < len) {
    line++;
    let end = body.indexOf("\n", pos);
    if (end === -1) end = len;
    const stop = end > pos && body.charCodeAt(end - 1) === CR ? end - 1 : end;
    count = 0;
    let cellStart = pos;
    for (;;) {
      if (count === starts.length) {
        starts = grow(starts);
        ends = grow(ends);
      }
      if (next !== -1 && next < cellStart) next = body.indexOf(delimiter, cellStart);
      starts[count] = cellStart;
      if (next === -1 || next >= stop) {
        ends[count] = stop;
        count++;
        break;
      }
      ends[count] = next;
      count++;
      cellStart = next + 1;
    }
    const lineStart = pos;
    pos = end + 1;
    if (count === 1 ? isBlank(body.slice(lineStart, stop)) : skipBlankRows && allBlank(count, cell)) continue;
    cursor.line = line;
    cursor.count = count;
    onRow(cursor);
  }
}

function allBlank(count: number, cell: (k: number) => string): boolean {
  for (let k = 0; k < count; k++) if (!isBlank(cell(k))) return false;
  return true;
}

function grow(a: Int32Array): Int32Array {
  const b = new Int32Array(a.length * 2);
  b.set(a);
  return b;
}
