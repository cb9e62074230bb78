// What the upload-parse worker does with one file, kept apart from the worker's message loop so
// the same code runs in the server thread when no worker can be started. Plain Node.
import { parseReaderExport, type ParseExportOptions, type ReaderExportResult } from "@/lib/plates/reader-export";
import { issue } from "@/lib/plates/issues";
import { isZip, MAX_XLSX_COLUMNS, MAX_XLSX_ROWS } from "@/lib/plates/xlsx";
import { emptyResult, type ImportFormat, type ImportParseResult } from "@/lib/chem/import-types";
import { parseCsvImport } from "@/lib/chem/import-table";
import { parseSdfImport } from "@/lib/chem/import-sdf";
import { decodeText } from "@/lib/plates/text-table";
import { parsePlateMapCsv, plateMapFromJson, type PlateMapParseResult } from "@/lib/plates/plate-map";
import type { PlateFormat } from "@/lib/plates/geometry";
import { guardXlsxZip, MAX_INFLATED_BYTES } from "./zip-guard";

export type UploadParseTask =
  | { kind: "plate-export"; bytes: Uint8Array; fileName: string; options: ParseExportOptions }
  | { kind: "compound-import"; bytes: Uint8Array; format: ImportFormat }
  | { kind: "plate-map-csv"; bytes: Uint8Array; fileName: string; format: PlateFormat }
  | { kind: "plate-map-json"; json: string };

export type UploadParseOutcome = ReaderExportResult | ImportParseResult | PlateMapParseResult;

const LIMITS = { maxInflatedBytes: MAX_INFLATED_BYTES, maxRows: MAX_XLSX_ROWS, maxColumns: MAX_XLSX_COLUMNS };

/** 1-based line of the first NUL character of decoded text (UTF-8, or UTF-16 with a BOM), or 0. */
function nulLine(bytes: Uint8Array): number {
  const text = decodeText(bytes);
  const at = text.indexOf("\0");
  if (at < 0) return 0;
  let line = 1;
  for (let i = text.indexOf("\n"); i >= 0 && i < at; i = text.indexOf("\n", i + 1)) line++;
  return line;
}

export async function runUploadParse(task: UploadParseTask): Promise<UploadParseOutcome> {
  if (task.kind === "plate-map-csv") return parsePlateMapCsv(task.bytes, task.format, task.fileName);
  if (task.kind === "plate-map-json") {
    let raw: unknown;
    try {
      raw = JSON.parse(task.json);
    } catch {
      return { ok: false, issues: [issue({}, "The plate map could not be read (it is not JSON).")] };
    }
    return plateMapFromJson(raw);
  }
  if (task.kind === "plate-export") {
    if (isZip(task.bytes)) {
      const g = await guardXlsxZip(task.bytes, LIMITS);
      if (!g.ok) return { ok: false, issues: [issue({ file: task.fileName }, g.message)] };
    }
    return parseReaderExport(task.bytes, task.fileName, task.options);
  }
  if (task.format !== "xlsx") {
    // NUL characters cannot be stored in Postgres text and no structure file holds one.
    const nul = nulLine(task.bytes);
    if (nul)
      return emptyResult(task.format, [`Line ${nul} contains a NUL character; the file looks like binary data.`]);
    return withoutRejected(task.format === "csv" ? parseCsvImport(task.bytes) : parseSdfImport(task.bytes));
  }
  if (isZip(task.bytes)) {
    const g = await guardXlsxZip(task.bytes, LIMITS);
    if (!g.ok) return emptyResult("xlsx", [`The ${g.message}.`]);
  }
  const { parseXlsxImport } = await import("@/lib/chem/import-xlsx");
  return withoutRejected(await parseXlsxImport(task.bytes));
}

/**
 * The raw values of rejected records stay in the worker: nothing stores them (the preview and the
 * report give field and reason), and a 20 MB cell would otherwise be copied to the server's thread.
 */
function withoutRejected(r: ImportParseResult): ImportParseResult {
  return { ...r, rejected: [] };
}
