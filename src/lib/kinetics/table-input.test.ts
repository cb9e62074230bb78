import { describe, expect, it } from "vitest";
import { parseCsv, readDoseResponseCsv, readMechanismCsv, TableInputError } from "./table-input";

// CSV conventions: RFC 4180 (quotes, "" escapes, CRLF) — an outside format specification.
describe("CSV input (RFC 4180 subset) with line and column in every error", () => {
  it("parses quotes, escaped quotes, CRLF, a BOM and blank lines, keeping file line numbers", () => {
    const rows = parseCsv('\ufeffa,b\r\n"x, y","say ""hi"""\r\n\r\n1,2\r\n');
    expect(rows).toEqual([
      { line: 1, cells: ["a", "b"] },
      { line: 2, cells: ["x, y", 'say "hi"'] },
      { line: 4, cells: ["1", "2"] },
    ]);
  });

  it("quoted and unquoted files give the same series", () => {
    const plain = "Compound,Concentration,Response\nA,1,90\nA,2,70\nA,4,50\nA,8,30\nA,16,10\n";
    const quoted =
      '"Compound","Concentration","Response"\r\n"A","1","90"\r\n"A","2","70"\r\n\r\n"A","4","50"\r\n"A","8","30"\r\n"A","16","10"\r\n';
    const a = readDoseResponseCsv(plain);
    const b = readDoseResponseCsv(quoted);
    expect(a[0]!.concentration).toEqual(b[0]!.concentration);
    expect(a[0]!.response).toEqual(b[0]!.response);
    expect(a[0]!.lines).toEqual([2, 3, 4, 5, 6]);
    expect(b[0]!.lines).toEqual([2, 3, 5, 6, 7]);
  });

  it("accepts units in headers but not two different concentration units", () => {
    const ok =
      "substrate (µM),inhibitor (µM),rate\n" +
      [1, 2, 5].flatMap((s) => [0, 1, 2].map((i) => `${s},${i},${s / (s + 2 + i)}`)).join("\n");
    expect(readMechanismCsv(ok)).toHaveLength(9);
    const bad = ok.replace("inhibitor (µM)", "inhibitor (nM)");
    expect(() => readMechanismCsv(bad)).toThrow(/line 1, column "inhibitor": unit "nM" differs/);
  });

  it("rejects hexadecimal, Infinity and ragged rows with the line", () => {
    const head = "compound,concentration,response\n";
    expect(() => readDoseResponseCsv(head + "A,0x10,1\n")).toThrow(
      /line 2, column "concentration": "0x10" is not a number/,
    );
    expect(() => readDoseResponseCsv(head + "A,1,Infinity\n")).toThrow(/line 2, column "response"/);
    expect(() => readDoseResponseCsv(head + "A,1\n")).toThrow(/line 2: 2 cells, but the header has 3/);
    expect(() => readDoseResponseCsv("")).toThrow(TableInputError);
    expect(() => readDoseResponseCsv(head)).toThrow(/no data rows/);
  });
});
