// What the upload-parse worker does with one file, kept apart from the worker's message loop so
// the same code runs in the server thread when no worker can be started. Plain Node.
import { parseReaderExport, type ParseExportOptions, type ReaderExportResult } from "@/lib/plates/reader-export";
import { issue } from "@/lib/plates/issues";
import { isZip, MAX_XLSX_COLUMNS, MAX_XLSX_ROWS } from "@/lib/plates/xlsx";
import { emptyResult, type ImportFormat, type ImportParseResult } from "@/lib/chem/import-types";
import { parseCsvImport } from "@/lib/chem/import-table";
import { parseSdfImport } from "@/lib/chem/import-sdf";
import { guardXlsxZip, MAX_INFLATED_BYTES } from "./zip-guard";

export type UploadParseTask =
  | { kind: "plate-export"; bytes: Uint8Array; fileName: string; options: ParseExportOptions }
  | { kind: "compound-import"; bytes: Uint8Array; format: ImportFormat };

export type UploadParseResult<T extends UploadParseTask> = T extends { kind: "plate-export" }
  ? ReaderExportResult
  : ImportParseResult;

const LIMITS = { maxInflatedBytes: MAX_INFLATED_BYTES, maxRows: MAX_XLSX_ROWS, maxColumns: MAX_XLSX_COLUMNS };

export async function runUploadParse(task: UploadParseTask): Promise<ReaderExportResult | ImportParseResult> {
  if (task.kind === "plate-export") {
    if (isZip(task.bytes)) {
      const g = await guardXlsxZip(task.bytes, LIMITS);
      if (!g.ok) return { ok: false, issues: [issue({ file: task.fileName }, g.message)] };
    }
    return parseReaderExport(task.bytes, task.fileName, task.options);
  }
  if (task.format === "csv") return parseCsvImport(task.bytes);
  if (task.format === "sdf") return parseSdfImport(task.bytes);
  if (isZip(task.bytes)) {
    const g = await guardXlsxZip(task.bytes, LIMITS);
    if (!g.ok) return emptyResult("xlsx", [`The ${g.message}.`]);
  }
  const { parseXlsxImport } = await import("@/lib/chem/import-xlsx");
  return parseXlsxImport(task.bytes);
}
