/**
 * Shared shapes and limits of the bulk import (CSV, XLSX, SDF → records → prepared compounds).
 *
 * Record numbers are 1-based as a chemist counts them (the first data row or the first SDF
 * record is record 1); `line` is where that record starts in the file: the text line for CSV and
 * SDF (the CSV header is line 1), the worksheet row number for XLSX.
 */
import type { BatchInput, StockInput } from "./validation";

export const MAX_IMPORT_RECORDS = 10_000;
export const MAX_IMPORT_BYTES = 25 * 1024 * 1024;

export const IMPORT_FORMATS = ["csv", "xlsx", "sdf"] as const;
export type ImportFormat = (typeof IMPORT_FORMATS)[number];

/** One record that passed the form checks (structure not yet parsed; see import-prepare.ts). */
export interface ImportRecord {
  recordNo: number;
  line: number;
  smiles?: string;
  molfile?: string;
  name?: string;
  aliases?: string[];
  batch?: BatchInput;
  stock?: StockInput;
}

export interface ImportIssue {
  /** 1-based record number. */
  record: number;
  /** Line (CSV, SDF) or worksheet row (XLSX) where the record starts. */
  line: number;
  /** The column header or SDF field as written in the file, or a canonical name (`smiles`). */
  field: string;
  message: string;
}

/** A record that failed, with its raw values by canonical field name, for the downloadable report. */
export interface RejectedRecord {
  recordNo: number;
  line: number;
  fields: Record<string, string>;
}

export interface ImportParseResult {
  format: ImportFormat;
  /** Records that passed the form checks, in file order. */
  records: ImportRecord[];
  /** Per-record problems (a record may have several). */
  issues: ImportIssue[];
  rejected: RejectedRecord[];
  /** Problems with the whole file (too large, no SMILES column, not a workbook…). When not empty, `records` is empty. */
  fileErrors: string[];
  /** Columns or SDF fields that were ignored, as written in the file. */
  ignoredFields: string[];
  /** Number of records seen (valid or not). */
  totalRecords: number;
}

export function emptyResult(format: ImportFormat, fileErrors: string[]): ImportParseResult {
  return { format, records: [], issues: [], rejected: [], fileErrors, ignoredFields: [], totalRecords: 0 };
}
