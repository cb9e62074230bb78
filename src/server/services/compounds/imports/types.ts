import "server-only";
import type { compoundImports } from "@/server/db/schema";
import type { ImportFormat, ImportIssue } from "@/lib/chem/import-types";

export type ImportMode = "all_or_nothing" | "valid_only";
export type ImportJob = typeof compoundImports.$inferSelect;

/** What the preview shows: counts, the per-record issues (record, line, field, reason) and warnings, capped. */
export type ImportPreview = {
  format: ImportFormat;
  totalRecords: number;
  valid: number;
  invalid: number;
  /** Record numbers that cannot be registered, ascending. */
  invalidRecords: number[];
  /** The stored problems: the first ones, each field and message capped (caps.ts). */
  issues: ImportIssue[];
  /** Problems found but not stored (past the caps); absent in jobs prepared before the caps. */
  issuesNotStored?: number;
  warnings: ImportIssue[];
  warningsNotStored?: number;
  ignoredFields: string[];
  /** A sample of the valid records for the preview table. */
  sample: { record: number; line: number; name: string | null; smiles: string; formula: string; mw: number }[];
  threads: number;
  prepareMs: number;
  /** Where the time went, in ms: parse (file → records), structures (workers), check (registry lookup), store (staging rows). */
  timings?: { parseMs: number; structuresMs: number; checkMs: number; storeMs: number };
};

export type ImportResult = {
  mode: ImportMode;
  registered: { record: number; line: number; registryId: string; name: string | null }[];
  notRegistered: { record: number; line: number; field: string; reason: string }[];
  /** Problems of the preview that were not stored (past its caps), so not listed in `notRegistered`. */
  notListed?: number;
};
