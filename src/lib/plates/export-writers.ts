/**
 * Write reader exports in the shapes the parser accepts: long tables and plate grids as CSV or
 * TSV text, and plate grids as XLSX (exceljs). Used by the fixture generator and the demo seed;
 * the written files are our own neutral layout, not any instrument's format.
 */
import ExcelJS from "exceljs";
import { parseWellName, plateDimensions, type PlateFormat, rowLabel } from "./geometry";

export interface GridRead {
  /** read time in seconds; omit for an endpoint file */
  readonly timeS?: number;
  readonly values: ReadonlyMap<string, number>;
}

function header(notes: readonly string[]): string[] {
  return notes.map((n) => n);
}

/** `well,value` rows in the order given. */
export function writeLongEndpoint(
  values: ReadonlyMap<string, number>,
  options: { notes?: readonly string[]; delimiter?: string } = {},
): string {
  const d = options.delimiter ?? ",";
  const lines = [...header(options.notes ?? []), ["well", "value"].join(d)];
  for (const [w, v] of values) lines.push(`${w}${d}${v}`);
  return lines.join("\n") + "\n";
}

/** `well,time_s,value`, one row per well and read, grouped by read. */
export function writeLongKinetic(
  timesS: readonly number[],
  wells: ReadonlyMap<string, readonly number[]>,
  options: { notes?: readonly string[]; delimiter?: string } = {},
): string {
  const d = options.delimiter ?? ",";
  const lines = [...header(options.notes ?? []), ["well", "time_s", "value"].join(d)];
  timesS.forEach((t, k) => {
    for (const [w, series] of wells) {
      const v = series[k];
      if (v !== undefined) lines.push(`${w}${d}${t}${d}${v}`);
    }
  });
  return lines.join("\n") + "\n";
}

function gridRows(format: PlateFormat, values: ReadonlyMap<string, number>): string[][] {
  const dim = plateDimensions(format);
  const rows: string[][] = [["", ...Array.from({ length: dim.columns }, (_, c) => String(c + 1))]];
  const cells: string[][] = Array.from({ length: dim.rows }, (_, r) => [
    rowLabel(r),
    ...new Array<string>(dim.columns).fill(""),
  ]);
  for (const [w, v] of values) {
    const p = parseWellName(w);
    if (!p || p.row >= dim.rows || p.column >= dim.columns)
      throw new RangeError(`"${w}" is not a well of a ${format}-well plate`);
    cells[p.row]![p.column + 1] = String(v);
  }
  return [...rows, ...cells];
}

/**
 * Plate grids, one block per read, a blank line between blocks; for kinetic reads the line
 * above each block is `Time (s): <t>`.
 */
export function writeGridText(
  format: PlateFormat,
  reads: readonly GridRead[],
  options: { notes?: readonly string[]; delimiter?: string } = {},
): string {
  const d = options.delimiter ?? ",";
  const lines: string[] = [...header(options.notes ?? [])];
  for (const read of reads) {
    if (lines.length > 0) lines.push("");
    if (read.timeS !== undefined) lines.push(`Time (s): ${read.timeS}`);
    for (const row of gridRows(format, read.values)) lines.push(row.join(d));
  }
  return lines.join("\n") + "\n";
}

/** The same layout as writeGridText in the first worksheet of an XLSX workbook (numbers as numbers). */
export async function writeGridXlsx(
  format: PlateFormat,
  reads: readonly GridRead[],
  options: { notes?: readonly string[]; sheetName?: string } = {},
): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  // A fixed date keeps the file's bytes the same from run to run.
  const fixed = new Date(Date.UTC(2024, 0, 1));
  wb.created = fixed;
  wb.modified = fixed;
  const ws = wb.addWorksheet(options.sheetName ?? "Results");
  for (const n of options.notes ?? []) ws.addRow([n]);
  for (const read of reads) {
    if (ws.rowCount > 0) ws.addRow([]);
    if (read.timeS !== undefined) ws.addRow([`Time (s): ${read.timeS}`]);
    for (const [i, row] of gridRows(format, read.values).entries()) {
      ws.addRow(row.map((c, j) => (i > 0 && j > 0 && c !== "" ? Number(c) : c)));
    }
  }
  return fixZipTimestamps(new Uint8Array(await wb.xlsx.writeBuffer()));
}

/**
 * Set every zip entry's DOS modification time to 2024-01-01 00:00 (local headers and central
 * directory, PKWARE APPNOTE 4.3.7 and 4.3.12), so committed workbooks do not change on every run.
 */
export function fixZipTimestamps(bytes: Uint8Array): Uint8Array {
  const out = bytes.slice();
  const view = new DataView(out.buffer, out.byteOffset, out.byteLength);
  const dosDate = ((2024 - 1980) << 9) | (1 << 5) | 1;
  let eocd = -1;
  for (let i = out.length - 22; i >= 0; i--) {
    if (view.getUint32(i, true) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) return out;
  const entries = view.getUint16(eocd + 10, true);
  let p = view.getUint32(eocd + 16, true);
  for (let e = 0; e < entries; e++) {
    if (view.getUint32(p, true) !== 0x02014b50) break;
    view.setUint16(p + 12, 0, true);
    view.setUint16(p + 14, dosDate, true);
    const local = view.getUint32(p + 42, true);
    if (view.getUint32(local, true) === 0x04034b50) {
      view.setUint16(local + 10, 0, true);
      view.setUint16(local + 12, dosDate, true);
    }
    p += 46 + view.getUint16(p + 28, true) + view.getUint16(p + 30, true) + view.getUint16(p + 32, true);
  }
  return out;
}
