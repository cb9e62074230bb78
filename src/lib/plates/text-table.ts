/**
 * Bytes → rows of text cells for CSV and TSV files from plate readers and compound lists.
 *
 * The rows come from the one CSV reader (src/lib/csv/read.ts, RFC 4180), used rather than
 * exceljs's CSV reader, which measured far slower here (about 1 s per 1,500 rows with defaults).
 * What stays here is what only these files need: decoding UTF-16 exports, spotting binary
 * uploads, and choosing the delimiter, because readers and spreadsheets in other locales write
 * tabs or semicolons. The delimiter is sniffed from the first 50 non-empty lines: the one of tab,
 * comma and semicolon found on the most lines wins; ties go to the file's extension
 * (.tsv → tab), then tab, comma, semicolon.
 */
import { CsvSyntaxError, readCsv } from "@/lib/csv/read";

export type Delimiter = "," | "\t" | ";";

export interface TableRow {
  /** 1-based line number where the record starts (text) or the worksheet row number (XLSX). */
  readonly line: number;
  readonly cells: string[];
}

/** Decode UTF-8 (BOM stripped) or UTF-16 with a BOM, as some plate readers write. */
export function decodeText(bytes: Uint8Array): string {
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) {
    return new TextDecoder("utf-16le").decode(bytes.subarray(2));
  }
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) {
    return new TextDecoder("utf-16be").decode(bytes.subarray(2));
  }
  const start = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  return new TextDecoder("utf-8").decode(bytes.subarray(start));
}

/**
 * Heuristic for binary content in the first 8 KB: a NUL byte, or more than 5 % control or
 * undecodable characters. Text files from readers never contain either (common practice).
 */
export function looksBinary(bytes: Uint8Array): boolean {
  const n = Math.min(bytes.length, 8192);
  const utf16 =
    bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff));
  if (utf16) return false;
  let odd = 0;
  for (let i = 0; i < n; i++) {
    const b = bytes[i]!;
    if (b === 0) return true;
    if (b < 32 && b !== 9 && b !== 10 && b !== 13 && b !== 12) odd++;
  }
  const sample = new TextDecoder("utf-8").decode(bytes.subarray(0, n));
  let bad = 0;
  for (let i = 0; i < sample.length; i++) if (sample.charCodeAt(i) === 0xfffd) bad++;
  return n > 0 && (odd + bad) / n > 0.05;
}

export function sniffDelimiter(text: string, fileName = ""): Delimiter {
  const lines: string[] = [];
  let pos = 0;
  while (lines.length < 50 && pos < text.length) {
    let end = text.indexOf("\n", pos);
    if (end < 0) end = text.length;
    const line = text.slice(pos, end);
    if (line.trim() !== "") lines.push(line);
    pos = end + 1;
  }
  const count = (d: string) => lines.filter((l) => l.includes(d)).length;
  const scores: [Delimiter, number][] = [
    ["\t", count("\t")],
    [",", count(",")],
    [";", count(";")],
  ];
  const best = Math.max(...scores.map((s) => s[1]));
  const tied = scores.filter((s) => s[1] === best).map((s) => s[0]);
  if (tied.length === 1) return tied[0]!;
  if (/\.tsv$|\.tab$/i.test(fileName) && tied.includes("\t")) return "\t";
  return tied[0]!;
}

export type TextTableResult =
  | { readonly ok: true; readonly rows: TableRow[] }
  | { readonly ok: false; readonly line: number; readonly message: string };

/**
 * Split text into rows of raw (untrimmed) cells. Blank lines and rows whose cells are all blank
 * (`,,,` lines between blocks) are dropped; a quote that is never closed is reported with its line.
 */
export function readTextTable(text: string, delimiter: Delimiter): TextTableResult {
  try {
    return { ok: true, rows: readCsv(text, { delimiter, skipBlankRows: true }) };
  } catch (e) {
    if (e instanceof CsvSyntaxError) return { ok: false, line: e.line, message: e.detail };
    throw e;
  }
}
