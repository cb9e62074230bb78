/**
 * XLSX import: the first worksheet with data, read by exceljs through the plates module's guarded
 * reader (zip-bomb size check, row and column caps). Node and browser both work, but this file
 * pulls in exceljs, so keep it out of client bundles: the register form never needs it.
 *
 * Formula cells come back as `=…` text and are refused per cell (CSV injection rule); date cells
 * come back as ISO timestamps at midnight UTC and are read as that calendar date.
 */
import { isOleCompound, readWorkbookRows } from "@/lib/plates/xlsx";
import { recordsFromRows } from "./import-table";
import { emptyResult, type ImportParseResult, MAX_IMPORT_BYTES } from "./import-types";

export async function parseXlsxImport(bytes: Uint8Array): Promise<ImportParseResult> {
  if (bytes.byteLength > MAX_IMPORT_BYTES) {
    return emptyResult("xlsx", [`The file is larger than ${MAX_IMPORT_BYTES / 1024 / 1024} MB.`]);
  }
  if (isOleCompound(bytes)) {
    return emptyResult("xlsx", ["This is a legacy .xls workbook; save it as .xlsx or CSV and upload again."]);
  }
  const book = await readWorkbookRows(bytes);
  if (!book.ok) return emptyResult("xlsx", [`The ${book.message}.`]);
  return recordsFromRows(book.rows, "xlsx");
}
