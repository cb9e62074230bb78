/**
 * XLSX workbooks → rows of text cells, through exceljs (not the `xlsx` package, whose registry
 * release has known flaws with crafted files; see the stack notes). Uploads are untrusted, so the
 * zip's declared uncompressed size and the sheet's rows and columns are capped before and after
 * loading. Only the first worksheet that holds any data is read.
 */
import ExcelJS from "exceljs";
import type { TableRow } from "./text-table";

/** Declared uncompressed size of all zip entries: a guard against zip bombs (common practice). */
export const MAX_XLSX_UNCOMPRESSED_BYTES = 300 * 1024 * 1024;
/** 1536 wells × 500 reads in a long table, plus room for headers and notes. */
export const MAX_XLSX_ROWS = 1536 * 500 + 1000;
export const MAX_XLSX_COLUMNS = 1000;

export function isZip(bytes: Uint8Array): boolean {
  return bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04;
}

/** Legacy binary Excel (.xls, OLE compound file). */
export function isOleCompound(bytes: Uint8Array): boolean {
  const sig = [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1];
  return bytes.length >= 8 && sig.every((b, i) => bytes[i] === b);
}

/**
 * Sum of the uncompressed sizes declared in the zip central directory (PKWARE APPNOTE 4.3.12,
 * 4.3.16), or undefined when the directory cannot be read (then the file is not a usable zip).
 */
export function declaredUncompressedSize(bytes: Uint8Array): number | undefined {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const minEocd = 22;
  if (bytes.length < minEocd) return undefined;
  let eocd = -1;
  for (let i = bytes.length - minEocd; i >= Math.max(0, bytes.length - minEocd - 65535); i--) {
    if (view.getUint32(i, true) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) return undefined;
  const entries = view.getUint16(eocd + 10, true);
  let p = view.getUint32(eocd + 16, true);
  let total = 0;
  for (let e = 0; e < entries; e++) {
    if (p + 46 > bytes.length || view.getUint32(p, true) !== 0x02014b50) return undefined;
    const size = view.getUint32(p + 24, true);
    if (size === 0xffffffff) return Number.POSITIVE_INFINITY; // zip64: far above any cap
    total += size;
    p += 46 + view.getUint16(p + 28, true) + view.getUint16(p + 30, true) + view.getUint16(p + 32, true);
  }
  return total;
}

/** Excel column letters for a zero-based column: 0 → A, 26 → AA. */
export function columnLetters(col: number): string {
  let n = col + 1;
  let s = "";
  while (n > 0) {
    const r = (n - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

function pad2(n: number): string {
  return String(n).padStart(2, "0");
}

/** A cell value as the text a CSV export would show; formulas come back as `=…` text. */
function cellText(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return String(v);
  if (typeof v === "string") return v;
  if (typeof v === "boolean") return v ? "TRUE" : "FALSE";
  if (v instanceof Date) {
    // Time-of-day cells (Excel's day 0, 1899-12-30) are read times such as 00:00:30.
    if (v.getUTCFullYear() <= 1900) {
      const days = Math.floor((v.getTime() - Date.UTC(1899, 11, 30)) / 86400000);
      const h = v.getUTCHours() + 24 * Math.max(0, days);
      const sec = v.getUTCSeconds() + v.getUTCMilliseconds() / 1000;
      return `${h}:${pad2(v.getUTCMinutes())}:${pad2(Math.floor(sec))}${sec % 1 ? String(sec % 1).slice(1) : ""}`;
    }
    return v.toISOString();
  }
  if (typeof v === "object") {
    const o = v as Record<string, unknown>;
    if (typeof o.formula === "string") return "=" + o.formula;
    if (typeof o.sharedFormula === "string") return "=" + o.sharedFormula;
    if (Array.isArray(o.richText))
      return o.richText.map((t) => (typeof t === "object" && t && "text" in t ? String(t.text) : "")).join("");
    if (typeof o.text === "string") return o.text;
    if (typeof o.error === "string") return o.error;
  }
  return String(v);
}

export type WorkbookRows =
  | { readonly ok: true; readonly sheet: string; readonly rows: TableRow[] }
  | { readonly ok: false; readonly message: string };

export async function readWorkbookRows(bytes: Uint8Array): Promise<WorkbookRows> {
  const declared = declaredUncompressedSize(bytes);
  if (declared === undefined) return { ok: false, message: "file is not a readable XLSX workbook (damaged zip)" };
  if (declared > MAX_XLSX_UNCOMPRESSED_BYTES) {
    return {
      ok: false,
      message: `workbook unpacks to more than ${MAX_XLSX_UNCOMPRESSED_BYTES / 1024 / 1024} MB; the limit guards against zip bombs`,
    };
  }
  const wb = new ExcelJS.Workbook();
  try {
    // exceljs takes an ArrayBuffer; slice() gives one that holds exactly these bytes.
    await wb.xlsx.load(bytes.slice().buffer, {
      ignoreNodes: ["dataValidations", "conditionalFormatting", "extLst", "drawing", "legacyDrawing"],
    });
  } catch {
    return { ok: false, message: "file is not a readable XLSX workbook" };
  }
  for (const ws of wb.worksheets) {
    if (ws.actualRowCount === 0) continue;
    if (ws.rowCount > MAX_XLSX_ROWS)
      return { ok: false, message: `worksheet "${ws.name}" has ${ws.rowCount} rows; the limit is ${MAX_XLSX_ROWS}` };
    if (ws.columnCount > MAX_XLSX_COLUMNS) {
      return {
        ok: false,
        message: `worksheet "${ws.name}" has ${ws.columnCount} columns; the limit is ${MAX_XLSX_COLUMNS}`,
      };
    }
    const rows: TableRow[] = [];
    ws.eachRow({ includeEmpty: false }, (row, rowNumber) => {
      const values = row.values;
      if (!Array.isArray(values)) return;
      const cells: string[] = new Array(Math.max(0, values.length - 1)).fill("");
      for (let c = 1; c < values.length; c++) cells[c - 1] = cellText(values[c]);
      if (cells.some((x) => x.trim() !== "")) rows.push({ line: rowNumber, cells });
    });
    if (rows.length > 0) return { ok: true, sheet: ws.name, rows };
  }
  return { ok: true, sheet: wb.worksheets[0]?.name ?? "", rows: [] };
}
