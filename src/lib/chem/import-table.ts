/**
 * Tabular import (CSV text or worksheet rows): the first non-blank row is the header, every later
 * non-blank row is one record. Text is read as the plates module reads reader exports: the one
 * CSV reader (src/lib/csv/read.ts, RFC 4180) with delimiter sniffing (comma, semicolon, tab) from
 * `@/lib/plates/text-table`; exceljs reads XLSX in `import-xlsx.ts`.
 */
import { decodeText, readTextTable, sniffDelimiter, type TableRow } from "@/lib/plates/text-table";
import { type CanonicalField, canonicalField, checkRecord, type RawFields } from "./import-fields";
import {
  emptyResult,
  type ImportFormat,
  type ImportParseResult,
  MAX_IMPORT_BYTES,
  MAX_IMPORT_RECORDS,
} from "./import-types";

/** Rows (header first) → checked records. */
export function recordsFromRows(rows: TableRow[], format: ImportFormat): ImportParseResult {
  const [header, ...data] = rows;
  if (!header) return emptyResult(format, ["The file has no rows: expected a header row and one row per compound."]);
  if (data.length > MAX_IMPORT_RECORDS) {
    return emptyResult(format, [
      `The file has ${data.length.toLocaleString("en")} records; the limit is ${MAX_IMPORT_RECORDS.toLocaleString("en")}. Split it into several files.`,
    ]);
  }
  const columns: (CanonicalField | undefined)[] = [];
  const labels: Partial<Record<CanonicalField, string>> = {};
  const ignoredFields: string[] = [];
  const fileErrors: string[] = [];
  header.cells.forEach((raw) => {
    const text = raw.trim();
    const field = canonicalField(text);
    if (field && labels[field] !== undefined) {
      fileErrors.push(`Columns "${labels[field]}" and "${text}" both mean ${field}; keep one.`);
    }
    if (field) labels[field] = text;
    else if (text !== "") ignoredFields.push(text);
    columns.push(field);
  });
  if (labels.smiles === undefined && labels.molfile === undefined) {
    fileErrors.push(
      `No structure column: the header row (line ${header.line}) needs a column named "smiles" (or "molfile"). Found: ${header.cells
        .map((c) => `"${c.trim()}"`)
        .join(", ")}.`,
    );
  }
  if (fileErrors.length > 0) return { ...emptyResult(format, fileErrors), ignoredFields };

  const result: ImportParseResult = { ...emptyResult(format, []), ignoredFields, totalRecords: data.length };
  data.forEach((row, i) => {
    const raw: RawFields = {};
    columns.forEach((field, c) => {
      if (field) raw[field] = row.cells[c] ?? "";
    });
    const { record, issues } = checkRecord(i + 1, row.line, raw, labels);
    if (record) result.records.push(record);
    else {
      result.issues.push(...issues);
      result.rejected.push({ recordNo: i + 1, line: row.line, fields: raw as Record<string, string> });
    }
  });
  return result;
}

/** CSV/TSV text or bytes (UTF-8, or UTF-16 with a BOM) → checked records. */
export function parseCsvImport(input: string | Uint8Array, fileName = ""): ImportParseResult {
  const size = typeof input === "string" ? input.length : input.byteLength;
  if (size > MAX_IMPORT_BYTES) {
    return emptyResult("csv", [`The file is larger than ${MAX_IMPORT_BYTES / 1024 / 1024} MB.`]);
  }
  const text = typeof input === "string" ? input.replace(/^\uFEFF/, "") : decodeText(input);
  const table = readTextTable(text, sniffDelimiter(text, fileName));
  if (!table.ok) return emptyResult("csv", [`Line ${table.line}: ${table.message}; nothing after it can be read.`]);
  return recordsFromRows(table.rows, "csv");
}
