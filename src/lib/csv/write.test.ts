// RFC 4180 (Shafranovich, "Common Format and MIME Type for CSV Files", 2005) for quoting;
// OWASP "CSV Injection" for the formula rule.
import { describe, expect, it } from "vitest";
import { csvField, isFormulaLike, neutraliseFormula, toCsv } from "./write";

describe("the one CSV writer", () => {
  it("quotes fields with commas, quotes, line breaks or edge spaces (RFC 4180)", () => {
    expect(csvField('a,"b"')).toBe('"a,""b"""');
    expect(csvField("two\nlines")).toBe('"two\nlines"');
    expect(csvField(" pad")).toBe('" pad"');
    expect(csvField("plain")).toBe("plain");
    expect(csvField(null)).toBe("");
    expect(csvField(Number.NaN)).toBe("");
    expect(csvField(-0.5)).toBe("-0.5");
  });
  it("neutralises formula-like text but never numbers (OWASP CSV Injection)", () => {
    for (const t of ["=1+2", "+SUM(A1)", "-cmd", "@x", "\tx", "\rx", "  =x"]) expect(isFormulaLike(t)).toBe(true);
    for (const t of ["-0.5", "+3", "1e-3", "name", ""]) expect(isFormulaLike(t)).toBe(false);
    expect(neutraliseFormula("=HYPERLINK()")).toBe("'=HYPERLINK()");
    expect(neutraliseFormula(-3)).toBe(-3);
  });
  it("writes a file with CRLF by default and leaves the header alone", () => {
    expect(toCsv(["a", "b"], [["=x", 1]])).toBe("a,b\r\n'=x,1\r\n");
    expect(toCsv(null, [["x"]], { eol: "\n", neutralise: false })).toBe("x\n");
  });
});
