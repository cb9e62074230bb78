// A guard run on every XLSX upload before exceljs sees it: the zip is walked from its central
// directory and every entry is inflated as a stream, counting the bytes that actually come out
// (the sizes a zip declares can lie, so they are never trusted), and the worksheets' XML is
// scanned as it inflates for rows and cells, so a zip bomb or a sheet over the row or column cap
// stops within a few megabytes of crossing the limit, before any workbook is built. Each entry's
// CRC-32 is checked too (exceljs does not), so a damaged file is not read as if it were whole.
// Plain Node (no "server-only"): it runs inside the upload-parse worker thread.
import zlib from "node:zlib";

const MIB = 1024 * 1024;

/**
 * Bytes all entries may inflate to together. A 1536-well plate with 100 reads in a long table is
 * about 25 MB of sheet XML; exceljs needs roughly 10× the XML in memory, so 100 MB keeps a
 * workbook within the worker's memory limit (chosen here; the 10× is an estimate, not measured).
 */
export const MAX_INFLATED_BYTES = 100 * MIB;
/** Entries in the zip: an XLSX has a dozen or so (chosen here). */
export const MAX_ENTRIES = 1000;

export interface ZipGuardLimits {
  readonly maxInflatedBytes: number;
  readonly maxRows: number;
  readonly maxColumns: number;
}

export type ZipGuardResult =
  | { readonly ok: true; readonly inflatedBytes: number; readonly rows: number; readonly columns: number }
  | { readonly ok: false; readonly message: string };

interface Entry {
  name: string;
  method: number;
  compressedSize: number;
  localOffset: number;
  crc32: number;
}

const refuse = (message: string): ZipGuardResult => ({ ok: false, message });

/** Central directory (PKWARE APPNOTE 4.3.12, 4.3.16); undefined when it cannot be read. */
function entriesOf(bytes: Uint8Array): Entry[] | string {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (bytes.length < 22) return "file is not a readable XLSX workbook (damaged zip: too short)";
  let eocd = -1;
  for (let i = bytes.length - 22; i >= Math.max(0, bytes.length - 22 - 65535); i--) {
    if (view.getUint32(i, true) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) return "file is not a readable XLSX workbook (damaged zip: no central directory)";
  const count = view.getUint16(eocd + 10, true);
  if (count > MAX_ENTRIES) return `file is not a usable XLSX workbook: its zip has more than ${MAX_ENTRIES} entries`;
  let p = view.getUint32(eocd + 16, true);
  const out: Entry[] = [];
  for (let e = 0; e < count; e++) {
    if (p + 46 > bytes.length || view.getUint32(p, true) !== 0x02014b50)
      return "file is not a readable XLSX workbook (damaged zip: broken central directory)";
    const nameLen = view.getUint16(p + 28, true);
    const name = new TextDecoder("latin1").decode(bytes.subarray(p + 46, Math.min(bytes.length, p + 46 + nameLen)));
    out.push({
      name,
      method: view.getUint16(p + 10, true),
      compressedSize: view.getUint32(p + 20, true),
      crc32: view.getUint32(p + 16, true),
      localOffset: view.getUint32(p + 42, true),
    });
    p += 46 + nameLen + view.getUint16(p + 30, true) + view.getUint16(p + 32, true);
  }
  return out;
}

/** Zero-based column of letters A…XFD. */
function columnOfLetters(s: string): number {
  let n = 0;
  for (let i = 0; i < s.length; i++) n = n * 26 + (s.charCodeAt(i) - 64);
  return n - 1;
}

/**
 * Counts rows and the widest row of worksheet XML as it streams: `<row` tags, and per row the
 * cells (`<c`) and the largest column letter of their `r="…"` references. Tags split across
 * chunks are carried over; text between tags is never kept.
 */
class SheetScanner {
  rows = 0;
  maxColumns = 0;
  private cellsInRow = 0;
  private carry = "";
  private static readonly TAG = /<(?:[A-Za-z_][\w.-]*:)?(row|c)(?=[\s>/])([^>]*)/g;
  private static readonly REF = /\br="([A-Z]{1,3})\d/;

  feed(chunk: Buffer): void {
    let text = this.carry + chunk.toString("latin1");
    const last = text.lastIndexOf("<");
    // An unfinished tag at the end is kept for the next chunk (only if it is short: no real tag is long).
    if (last >= 0 && text.length - last < 512 && text.indexOf(">", last) < 0) {
      this.carry = text.slice(last);
      text = text.slice(0, last);
    } else this.carry = "";
    SheetScanner.TAG.lastIndex = 0;
    for (let m = SheetScanner.TAG.exec(text); m; m = SheetScanner.TAG.exec(text)) {
      if (m[1] === "row") {
        this.rows++;
        this.cellsInRow = 0;
      } else {
        this.cellsInRow++;
        const ref = SheetScanner.REF.exec(m[2]!);
        const col = ref ? columnOfLetters(ref[1]!) + 1 : this.cellsInRow;
        if (col > this.maxColumns) this.maxColumns = col;
        if (this.cellsInRow > this.maxColumns) this.maxColumns = this.cellsInRow;
      }
    }
  }
}

function inflateEntry(
  data: Uint8Array,
  onChunk: (chunk: Buffer) => string | undefined,
): Promise<{ ok: true } | { ok: false; message: string }> {
  return new Promise((resolve) => {
    const inflate = zlib.createInflateRaw({ chunkSize: 256 * 1024 });
    let settled = false;
    const done = (r: { ok: true } | { ok: false; message: string }) => {
      if (settled) return;
      settled = true;
      inflate.destroy();
      resolve(r);
    };
    inflate.on("data", (chunk: Buffer) => {
      const stop = onChunk(chunk);
      if (stop) done({ ok: false, message: stop });
    });
    inflate.on("error", () =>
      done({ ok: false, message: "file is not a readable XLSX workbook (damaged zip: an entry does not inflate)" }),
    );
    inflate.on("end", () => done({ ok: true }));
    inflate.end(data);
  });
}

/**
 * Walks and inflates every entry of an XLSX zip, refusing at the first limit crossed: the total
 * inflated bytes (counted, not declared), rows, or columns of any worksheet.
 */
export async function guardXlsxZip(bytes: Uint8Array, limits: ZipGuardLimits): Promise<ZipGuardResult> {
  const entries = entriesOf(bytes);
  if (typeof entries === "string") return refuse(entries);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let inflated = 0;
  let rows = 0;
  let columns = 0;
  const overInflated = `workbook inflates beyond ${limits.maxInflatedBytes / MIB} MB; the limit guards against zip bombs`;
  for (const e of entries) {
    const lh = e.localOffset;
    if (lh + 30 > bytes.length || view.getUint32(lh, true) !== 0x04034b50)
      return refuse("file is not a readable XLSX workbook (damaged zip: an entry's header is missing)");
    const start = lh + 30 + view.getUint16(lh + 26, true) + view.getUint16(lh + 28, true);
    // The compressed size is only used to slice the input; what matters is what inflates.
    const data = bytes.subarray(start, Math.min(bytes.length, start + e.compressedSize));
    if (start + e.compressedSize > bytes.length)
      return refuse("file is not a readable XLSX workbook (damaged zip: truncated)");
    const isSheet = /^xl\/worksheets\/[^/]+\.xml$/i.test(e.name);
    const scanner = isSheet ? new SheetScanner() : null;
    const sheetName = e.name.replace(/^xl\/worksheets\//i, "").slice(0, 60);
    let crc = 0;
    const onChunk = (chunk: Buffer): string | undefined => {
      inflated += chunk.byteLength;
      crc = zlib.crc32(chunk, crc);
      if (inflated > limits.maxInflatedBytes) return overInflated;
      if (!scanner) return undefined;
      scanner.feed(chunk);
      if (scanner.rows > limits.maxRows) return `worksheet ${sheetName} has more than ${limits.maxRows} rows`;
      if (scanner.maxColumns > limits.maxColumns)
        return `worksheet ${sheetName} has more than ${limits.maxColumns} columns`;
      return undefined;
    };
    if (e.method === 0) {
      const stop = onChunk(Buffer.from(data.buffer, data.byteOffset, data.byteLength));
      if (stop) return refuse(stop);
    } else if (e.method === 8) {
      const r = await inflateEntry(data, onChunk);
      if (!r.ok) return refuse(r.message);
    } else
      return refuse(
        `file is not a usable XLSX workbook: zip entry ${e.name.slice(0, 60)} uses an unsupported compression`,
      );
    if (crc >>> 0 !== e.crc32 >>> 0)
      return refuse(
        `file is not a readable XLSX workbook (damaged zip: ${e.name.slice(0, 60)} fails its CRC-32 check)`,
      );
    if (scanner) {
      rows = Math.max(rows, scanner.rows);
      columns = Math.max(columns, scanner.maxColumns);
    }
  }
  return { ok: true, inflatedBytes: inflated, rows, columns };
}
