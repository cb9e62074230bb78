import "server-only";
import { capMessage } from "@/server/workers/upload-refusal";
import type { ImportIssue } from "@/lib/chem/import-types";

/**
 * What an import job keeps of its problems. A hostile file (a 20 MB cell, a header line of
 * millions of characters, 10,000 records with several problems each) must not become megabytes
 * of JSON in the job row, returned on every poll of the page. Limits chosen here, not measured:
 * a person reads the first few hundred problems, fixes the file and uploads it again.
 */
export const MAX_STORED_ISSUES = 1000;
/** Characters of all stored problems together (fields and messages); past it, problems are counted, not kept. */
export const MAX_STORED_ISSUE_CHARS = 256 * 1024;
/** Longest field name kept (a column header as written in the file). */
export const MAX_FIELD_CHARS = 200;
/** Ignored columns kept by name, each cut like a field name. */
export const MAX_IGNORED_FIELDS = 100;

const capIssue = (i: ImportIssue): ImportIssue => ({
  record: i.record,
  line: i.line,
  field: capMessage(i.field, MAX_FIELD_CHARS),
  message: capMessage(i.message),
});

/**
 * The issues to store, in their order, each field and message cut (`capMessage`: 2,048 characters
 * + "… (truncated)"), at most `MAX_STORED_ISSUES` of them and `MAX_STORED_ISSUE_CHARS` in all;
 * `notStored` counts the rest so the preview can say how many were cut.
 */
export function capIssues(issues: readonly ImportIssue[]): { kept: ImportIssue[]; notStored: number } {
  const kept: ImportIssue[] = [];
  let chars = 0;
  for (const i of issues) {
    if (kept.length >= MAX_STORED_ISSUES) break;
    const c = capIssue(i);
    chars += c.field.length + c.message.length;
    if (chars > MAX_STORED_ISSUE_CHARS) break;
    kept.push(c);
  }
  return { kept, notStored: issues.length - kept.length };
}

/** Ignored column names, each cut, at most `MAX_IGNORED_FIELDS`, with a line saying how many more. */
export function capIgnoredFields(fields: readonly string[]): string[] {
  const kept = fields.slice(0, MAX_IGNORED_FIELDS).map((f) => capMessage(f, MAX_FIELD_CHARS));
  if (fields.length > MAX_IGNORED_FIELDS) kept.push(`… and ${fields.length - MAX_IGNORED_FIELDS} more`);
  return kept;
}
