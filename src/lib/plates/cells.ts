/** Cell-level rules shared by the plate map and the reader export parsers. */
import { isFormulaLike } from "@/lib/csv/write";
import { quoteCell } from "./issues";

const NUMBER_RE = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const DECIMAL_COMMA_RE = /^[+-]?\d+,\d+$/;

/**
 * Parse a decimal number; undefined when the text is not one. With `decimalComma`, `0,25` is
 * read as 0.25 (only used when the delimiter is not a comma).
 */
export function parseNumber(raw: string, decimalComma = false): number | undefined {
  const s = raw.trim();
  if (NUMBER_RE.test(s)) {
    const n = Number(s);
    return Number.isFinite(n) ? n : undefined;
  }
  if (decimalComma && DECIMAL_COMMA_RE.test(s)) return Number(s.replace(",", "."));
  return undefined;
}

/**
 * Text that a spreadsheet would run as a formula when the file is opened or exported again (the
 * rule is `isFormulaLike` in src/lib/csv/write.ts; OWASP, "CSV Injection"). Returns the message
 * for an upload that is refused, or undefined when the cell is safe.
 */
export function formulaInjectionMessage(raw: string): string | undefined {
  if (!isFormulaLike(raw)) return undefined;
  const first = raw[0]!;
  const lead = raw.trimStart()[0];
  const shown = lead !== undefined && "=+-@".includes(lead) ? lead : first === "\t" ? "a tab" : "a carriage return";
  const what = shown.length === 1 ? `"${shown}"` : shown;
  return `${quoteCell(raw)} starts with ${what}, which a spreadsheet may run as a formula; text like this is refused`;
}
