/**
 * The one CSV writer: RFC 4180 quoting and the one formula-injection rule, used by every file the
 * product writes (hit exports, import reports, plate maps).
 *
 * Formula injection (OWASP, "CSV Injection"): a text cell that starts with = + - @, a tab or a
 * carriage return and is not a plain number would be run as a formula by a spreadsheet. The writer
 * prefixes such text with a single quote; numbers are never touched (a negative LipE stays a
 * number, "-0.5" stays "-0.5").
 */

export type CsvValue = string | number | boolean | null | undefined;

const NUMBER_RE = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** True when a spreadsheet could run this text as a formula (see the module comment). */
export function isFormulaLike(text: string): boolean {
  if (text.length === 0) return false;
  const first = text[0]!;
  const trimmed = text.trimStart();
  const lead = trimmed[0];
  const risky = first === "\t" || first === "\r" || (lead !== undefined && "=+-@".includes(lead));
  return risky && !NUMBER_RE.test(trimmed.trim());
}

/** Formula-like text gets a leading apostrophe; everything else is returned unchanged. */
export function neutraliseFormula<T extends CsvValue>(v: T): T | string {
  return typeof v === "string" && isFormulaLike(v) ? `'${v}` : v;
}

/**
 * One field, RFC 4180: a field with a comma, quote, CR, LF or surrounding spaces is quoted and
 * its quotes doubled. Non-finite numbers and null/undefined are empty. No neutralising here.
 */
export function csvField(v: CsvValue): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return Number.isFinite(v) ? String(v) : "";
  const s = String(v);
  return /[",\r\n]/.test(s) || s !== s.trim() ? `"${s.replace(/"/g, '""')}"` : s;
}

export type CsvWriteOptions = {
  /** Line end between records and after the last one: "\r\n" (RFC 4180, default) or "\n". */
  eol?: "\r\n" | "\n";
  /** Neutralise formula-like text in data rows (default true). The header row is never touched. */
  neutralise?: boolean;
};

/** A whole file: the header, then each row, every record ended with the line end. */
export function toCsv(
  header: readonly string[] | null,
  rows: Iterable<readonly CsvValue[]>,
  options: CsvWriteOptions = {},
): string {
  const eol = options.eol ?? "\r\n";
  const safe = options.neutralise ?? true;
  const lines: string[] = [];
  if (header) lines.push(header.map(csvField).join(","));
  for (const r of rows) lines.push(r.map((v) => csvField(safe ? neutraliseFormula(v) : v)).join(","));
  return lines.length === 0 ? "" : `${lines.join(eol)}${eol}`;
}
