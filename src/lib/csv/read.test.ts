// RFC 4180 (Shafranovich, "Common Format and MIME Type for CSV Files", 2005) is the format; Python's
// csv module (python3 on the machine, a general-purpose reference reader) is the outside check of
// how quoted fields, doubled quotes, embedded delimiters and line breaks split.
import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { CsvSyntaxError, forEachCsvRow, readCsv } from "./read";

/** Python's csv.reader on the same text, blank rows dropped as `skipBlankRows` does. */
function python(text: string, delimiter = ","): string[][] {
  const py = execFileSync(
    "python3",
    [
      "-c",
      "import csv,io,json,sys; d=sys.argv[1]; print(json.dumps([r for r in csv.reader(io.StringIO(sys.stdin.read(), newline=''), delimiter=d) if any(c.strip() for c in r)]))",
      delimiter,
    ],
    { input: text },
  ).toString();
  return JSON.parse(py) as string[][];
}

describe("the one CSV reader", () => {
  it("splits quoted fields, doubled quotes, embedded delimiters and line breaks as Python's csv module does", () => {
    const text = 'a,"b,c","say ""hi"""\r\n"multi\nline",2,3\n\nx,,z\n';
    expect(readCsv(text, { skipBlankRows: true }).map((r) => r.cells)).toEqual(python(text));
    expect(readCsv(text, { skipBlankRows: true }).map((r) => r.line)).toEqual([1, 2, 5]);
  });

  it("agrees with Python on semicolon and tab files, quoted or not", () => {
    for (const [text, d] of [
      ['well;value\r\nA1;"0,25"\r\nA2;"1;2"\r\n', ";"],
      ["well\tvalue\nA1\t0.5\n\nA2\t\t\n", "\t"],
      ['a\t"b\tc"\n"x ""y"""\t2\n', "\t"],
    ] as const)
      expect(readCsv(text, { delimiter: d, skipBlankRows: true }).map((r) => r.cells)).toEqual(python(text, d));
  });

  it("keeps each record's first line across quoted line breaks, CRLF, LF and lone CR", () => {
    const text = 'h1,h2\r\n"two\r\nlines",x\rnext,"a\nb\nc"\nlast,1';
    expect(readCsv(text)).toEqual([
      { line: 1, cells: ["h1", "h2"] },
      { line: 2, cells: ["two\r\nlines", "x"] },
      { line: 4, cells: ["next", "a\nb\nc"] },
      { line: 7, cells: ["last", "1"] },
    ]);
  });

  it("ignores a byte order mark and lines of spaces; all-blank rows only with skipBlankRows", () => {
    const text = "\ufeffa,b\n   \n,\n1,2\n";
    expect(readCsv(text)).toEqual([
      { line: 1, cells: ["a", "b"] },
      { line: 3, cells: ["", ""] },
      { line: 4, cells: ["1", "2"] },
    ]);
    expect(readCsv(text, { skipBlankRows: true }).map((r) => r.line)).toEqual([1, 4]);
  });

  it("the fast path (no quotes) and the tokenizer give the same rows", () => {
    const plain = "x,y,z\n1, 2 ,3\r\n\n,,\n4,,6\nend";
    const quoted = plain.replace("end", '"end"');
    for (const skipBlankRows of [false, true]) {
      const a = readCsv(plain, { skipBlankRows });
      const b = readCsv(quoted, { skipBlankRows });
      expect(b).toEqual(a);
    }
    expect(readCsv(plain).at(-1)).toEqual({ line: 6, cells: ["end"] });
  });

  it("drops spaces before an opening quote, keeps text after the closing one, and reads a stray quote literally", () => {
    expect(readCsv('  "a, b" ,c"d,"e"f\n')[0]!.cells).toEqual(["a, b ", 'c"d', "ef"]);
    expect(readCsv('a,b,\n"",x\n').map((r) => r.cells)).toEqual([
      ["a", "b", ""],
      ["", "x"],
    ]);
  });

  it("a quote that is never closed is an error naming the line where it opened", () => {
    const bad = 'a,b\n1,2\n3,"four\n5,6\n';
    expect(() => readCsv(bad)).toThrow(CsvSyntaxError);
    expect(() => readCsv(bad)).toThrow("line 3: a quoted cell is not closed");
    const e = (() => {
      try {
        readCsv(bad);
      } catch (x) {
        return x as CsvSyntaxError;
      }
    })();
    expect(e!.line).toBe(3);
  });

  it("the cursor reads cells by index without building rows, and a single-column file stays linear", () => {
    const seen: [number, number, string][] = [];
    forEachCsvRow("a;b;c\n1;2\n", (row) => seen.push([row.line, row.count, row.cell(row.count - 1)]), {
      delimiter: ";",
    });
    expect(seen).toEqual([
      [1, 3, "c"],
      [2, 2, "2"],
    ]);
    const lines = Array.from({ length: 200_000 }, (_, k) => String(k));
    const t0 = performance.now();
    const rows = readCsv(lines.join("\n") + "\n,end\n");
    expect(rows).toHaveLength(200_001);
    expect(rows.at(-1)!.cells).toEqual(["", "end"]);
    expect(performance.now() - t0).toBeLessThan(2000);
  });

  it("refuses a delimiter that is not one plain character", () => {
    expect(() => readCsv("a", { delimiter: ",," })).toThrow(RangeError);
    expect(() => readCsv("a", { delimiter: '"' })).toThrow(RangeError);
  });
});
