/**
 * Problems found in a plate map or a reader export. `message` is a sentence for people; `line`
 * (text files, 1-based) or `cell` (XLSX, e.g. `C7`) and `well` say where. `text` is the whole
 * sentence with the file name, e.g. `plate-07.csv line 12, well B3: "abc" is not a number`.
 */
export interface PlateIssue {
  readonly file?: string;
  readonly line?: number;
  readonly cell?: string;
  readonly well?: string;
  readonly message: string;
  readonly text: string;
}

export interface IssueLocation {
  readonly file?: string;
  readonly line?: number;
  readonly cell?: string;
  readonly well?: string;
}

export function issue(where: IssueLocation, message: string): PlateIssue {
  const parts: string[] = [];
  if (where.file) parts.push(where.file);
  if (where.line !== undefined) parts.push(`line ${where.line}`);
  if (where.cell !== undefined) parts.push(`cell ${where.cell}`);
  let head = parts.join(" ");
  if (where.well) head = head ? `${head}, well ${where.well}` : `well ${where.well}`;
  const text = head ? `${head}: ${message}` : message;
  const out: { -readonly [K in keyof PlateIssue]: PlateIssue[K] } = { message, text };
  if (where.file !== undefined) out.file = where.file;
  if (where.line !== undefined) out.line = where.line;
  if (where.cell !== undefined) out.cell = where.cell;
  if (where.well !== undefined) out.well = where.well;
  return out;
}

/** Stop collecting after this many issues: one bad column in a 1536-well file is enough to show. */
export const MAX_ISSUES = 50;

/** Show at most 40 characters of a cell in a message, so a crafted file cannot flood the log. */
export function quoteCell(raw: string): string {
  const s = raw.length > 40 ? raw.slice(0, 40) + "…" : raw;
  return JSON.stringify(s);
}
