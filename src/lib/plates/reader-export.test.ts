// Checks: shape detection and exact messages of the export parser. Outside references: RFC 4180
// quoting (checked against Python's csv module in src/lib/csv/read.test.ts); XLSX files written by
// exceljs (a general-purpose library) and read back; the formula-injection rule from the OWASP
// "CSV Injection" guidance. Plate values here are invented.
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { parseReaderExport, parseReaderExportText, type ReaderExportResult } from "./reader-export";

const enc = new TextEncoder();

function grid(rows: number, cols: number, value: (r: number, c: number) => string | number, delimiter = ","): string[] {
  const out = [["", ...Array.from({ length: cols }, (_, c) => String(c + 1))].join(delimiter)];
  for (let r = 0; r < rows; r++) {
    const label = r < 26 ? String.fromCharCode(65 + r) : "A" + String.fromCharCode(65 + r - 26);
    out.push([label, ...Array.from({ length: cols }, (_, c) => String(value(r, c)))].join(delimiter));
  }
  return out;
}

function texts(r: ReaderExportResult): string[] {
  return r.ok ? [] : r.issues.map((i) => i.text);
}

function parse(text: string, name = "plate-07.csv", format?: 96 | 384 | 1536): ReaderExportResult {
  return parseReaderExportText(text, name, format ? { format } : {});
}

describe("long tables", () => {
  it("reads well,value with notes above and any header case", () => {
    const r = parse(
      ["Reader export (invented)", "Plate,7", "", "Well,Value", "A1,100", "a02,200.5", "H12,-3e-1"].join("\n"),
    );
    expect(r.ok).toBe(true);
    if (!r.ok || r.export.shape !== "long-endpoint") throw new Error("wrong shape");
    expect(r.export.format).toBe(96);
    expect(r.export.reads).toBe(1);
    expect([...r.export.wells]).toEqual([
      ["A1", 100],
      ["A2", 200.5],
      ["H12", -0.3],
    ]);
    expect(r.export.preview.summary).toBe(
      "CSV, long table, endpoint: 96-well plate, 3 wells, 1 read, values -0.3 to 200.5",
    );
  });

  it("reads well,time_s,value in any row order and sorts each series", () => {
    const r = parse(["well,time_s,value", "B3,60,12", "B3,0,10", "A1,0,5", "B3,30,11", "A1,30,6"].join("\r\n"));
    if (!r.ok || r.export.shape !== "long-kinetic") throw new Error("wrong shape");
    expect(r.export.reads).toBe(3);
    expect(r.export.timesS).toEqual([0, 30, 60]);
    expect(r.export.wells.get("B3")).toEqual([
      { timeS: 0, value: 10 },
      { timeS: 30, value: 11 },
      { timeS: 60, value: 12 },
    ]);
    expect([...r.export.wells.keys()]).toEqual(["A1", "B3"]);
  });

  it("reads time in minutes when the column says so, and refuses a time column without unit", () => {
    const r = parse("well,time_min,value\nA1,0.5,1\n");
    expect(r.ok && r.export.shape === "long-kinetic" && r.export.timesS).toEqual([30]);
    expect(texts(parse("well,time,value\nA1,0.5,1\n"))).toEqual([
      'plate-07.csv line 1: column "time" has no unit; name it time_s (seconds)',
    ]);
  });

  it("infers the smallest format, or checks the plate map's", () => {
    const r = parse("well,value\nA1,1\nP24,2\n");
    expect(r.ok && r.export.format).toBe(384);
    expect(texts(parse("well,value\nA1,1\nP24,2\n", "p.csv", 96))).toEqual([
      'p.csv line 3: "P24" is not a well of a 96-well plate',
    ]);
    expect(parse("well,value\nAF48,1\n").ok && parse("well,value\nAF48,1\n", "x.csv", 1536).ok).toBe(true);
  });

  it("reports every bad-input case with file, line and well", () => {
    expect(texts(parse("well,value\nA1,1\nB3,abc\n"))).toEqual(['plate-07.csv line 3, well B3: "abc" is not a number']);
    expect(texts(parse("well,value\nA1,1\nA01,2\n"))).toEqual([
      "plate-07.csv line 3, well A1: well is listed twice (first on line 2)",
    ]);
    expect(texts(parse("well,time_s,value\nA1,0,1\nA1,0,2\n"))).toEqual([
      "plate-07.csv line 3, well A1: time 0 s is listed twice for this well (first on line 2)",
    ]);
    expect(texts(parse("well,value\nZZ9,1\n"))).toEqual(['plate-07.csv line 2: "ZZ9" is not a well name']);
    expect(texts(parse("well,value\nA1,\n"))).toEqual(["plate-07.csv line 2, well A1: value is missing"]);
    expect(texts(parse("well,value\nA1,=1+2\n"))).toEqual([
      'plate-07.csv line 2: "=1+2" starts with "=", which a spreadsheet may run as a formula; text like this is refused',
    ]);
    expect(texts(parse("well,value\n@A1,1\n"))).toEqual([
      'plate-07.csv line 2: "@A1" starts with "@", which a spreadsheet may run as a formula; text like this is refused',
    ]);
    expect(texts(parse("well,value\n"))).toEqual(["plate-07.csv line 1: the table has a header but no wells"]);
    expect(texts(parse('well,value\nA1,1\nA2,"2\nA3,3\n'))).toEqual([
      "plate-07.csv line 3: a quoted cell is not closed",
    ]);
    const times = ["well,time_s,value", ...Array.from({ length: 501 }, (_, i) => `A1,${i},1`)].join("\n");
    expect(texts(parse(times))).toEqual([
      "plate-07.csv line 502, well A1: file has more than 500 reads (distinct times); the limit is 500",
    ]);
  });

  it("keeps negative numbers (blank-subtracted signals) apart from formula-like text", () => {
    const r = parse("well,value\nA1,-12.5\nA2,+3\n");
    expect(r.ok).toBe(true);
    expect(texts(parse("well,value\nA1,-12.5x\n"))[0]).toContain('"-12.5x" starts with "-"');
  });
});

describe("plate grids", () => {
  it("reads a 96-well endpoint grid with notes and an offset start column", () => {
    const lines = [
      "Invented export",
      "Wavelength,450 nm",
      ...grid(8, 12, (r, c) => r * 100 + c).map((l) => "note," + l),
    ];
    const r = parse(lines.join("\n"));
    if (!r.ok || r.export.shape !== "grid-endpoint") throw new Error(texts(r).join("; "));
    expect(r.export.format).toBe(96);
    expect(r.export.wells.size).toBe(96);
    expect(r.export.wells.get("H12")).toBe(711);
    expect([...r.export.wells.keys()].slice(0, 3)).toEqual(["A1", "A2", "A3"]);
  });

  it("reads 384 and 1536 grids (rows past Z are AA–AF)", () => {
    const r384 = parse(grid(16, 24, () => 1).join("\n"));
    expect(r384.ok && r384.export.format).toBe(384);
    const r1536 = parse(grid(32, 48, (r, c) => r * 48 + c).join("\n"));
    if (!r1536.ok || r1536.export.shape !== "grid-endpoint") throw new Error(texts(r1536).join("; "));
    expect(r1536.export.wells.get("AF48")).toBe(1535);
    expect(r1536.export.wells.get("AA1")).toBe(26 * 48);
  });

  it("treats blank grid cells as wells not read", () => {
    const r = parse(grid(8, 12, (r, c) => (r === 0 && c === 0 ? "" : 5)).join("\n"));
    expect(r.ok && r.export.wells.size).toBe(95);
    expect(r.ok && r.export.wells.has("A1")).toBe(false);
  });

  it("sniffs tab and semicolon delimiters; decimal commas only when the delimiter is not a comma", () => {
    const tsv = parse(grid(8, 12, () => "1.5", "\t").join("\n"), "plate.tsv");
    expect(tsv.ok && tsv.export.preview.source).toBe("TSV");
    const semi = parse(grid(8, 12, () => "0,25", ";").join("\n"), "plate.csv");
    expect(semi.ok && semi.export.shape === "grid-endpoint" && semi.export.wells.get("C3")).toBe(0.25);
  });

  it("reads kinetic grids with the time on the line above each block, in every documented form", () => {
    const forms = [
      "Time (s): 0",
      "Time [s],30",
      "time_s=60",
      "Time: 90 s",
      "Time,0:02:00",
      "Read 6 time: 2.5 min",
      "180",
      "3:30",
    ];
    const lines: string[] = ["Invented kinetic export", ""];
    forms.forEach((f, i) => lines.push(f, ...grid(8, 12, (r, c) => i * 10 + r + c / 100), ""));
    const r = parse(lines.join("\n"));
    if (!r.ok || r.export.shape !== "grid-kinetic") throw new Error(texts(r).join("; "));
    expect(r.export.timesS).toEqual([0, 30, 60, 90, 120, 150, 180, 210]);
    expect(r.export.reads).toBe(8);
    expect(r.export.wells.get("B2")!.map((p) => p.value)).toEqual([
      1.01, 11.01, 21.01, 31.01, 41.01, 51.01, 61.01, 71.01,
    ]);
    expect(r.export.preview.summary).toBe(
      "CSV, plate grids, kinetic: 96-well plate, 96 wells, 8 reads from 0 s to 210 s, values 0 to 77.11",
    );
  });

  it("takes the time from the block's corner cell too", () => {
    const block = (t: string) => grid(8, 12, () => 1).map((l, i) => (i === 0 ? t + l : l));
    const r = parse([...block("0 s"), ...block("30 s")].join("\n"));
    expect(r.ok && r.export.shape === "grid-kinetic" && r.export.timesS).toEqual([0, 30]);
  });

  it("reports grid problems exactly", () => {
    expect(texts(parse(grid(10, 12, () => 1).join("\n")))).toEqual([
      "plate-07.csv line 1: plate grid has 10 rows × 12 columns; a plate has 8 × 12, 16 × 24 or 32 × 48",
    ]);
    expect(texts(parse(grid(16, 24, () => 1).join("\n"), "plate-07.csv", 96))).toEqual([
      "plate-07.csv line 1: plate grid is 16 × 24 (384-well) but the plate map is 96-well (8 × 12)",
    ]);
    expect(texts(parse(grid(8, 12, (r, c) => (r === 1 && c === 2 ? "abc" : 1)).join("\n")))).toEqual([
      'plate-07.csv line 3, well B3: "abc" is not a number',
    ]);
    expect(texts(parse(grid(8, 12, (r, c) => (r === 1 && c === 2 ? "OVRFLW" : 1)).join("\n")))).toEqual([
      'plate-07.csv line 3, well B3: "OVRFLW" is not a number',
    ]);
    expect(texts(parse(grid(8, 12, (r, c) => (r === 0 && c === 0 ? "+cmd" : 1)).join("\n")))).toEqual([
      'plate-07.csv line 2, well A1: "+cmd" starts with "+", which a spreadsheet may run as a formula; text like this is refused',
    ]);
    expect(texts(parse([...grid(8, 12, () => 1), ...grid(8, 12, () => 2)].join("\n")))).toEqual([
      'plate-07.csv line 1: file has 2 plate grids, and this one has no read time above it; write e.g. "Time (s): 30" on the line above each grid',
      'plate-07.csv line 10: file has 2 plate grids, and this one has no read time above it; write e.g. "Time (s): 30" on the line above each grid',
    ]);
    expect(
      texts(parse(["Time (s): 30", ...grid(8, 12, () => 1), "Time (s): 30", ...grid(8, 12, () => 2)].join("\n"))),
    ).toEqual(["plate-07.csv line 12: read time 30 s appears twice (first at the grid on line 2)"]);
    expect(
      texts(parse(["Time: soon", ...grid(8, 12, () => 1), "Time (s): 30", ...grid(8, 12, () => 2)].join("\n")))[0],
    ).toBe(
      'plate-07.csv line 2: file has 2 plate grids, and this one has "Time: soon" is not a read time; write e.g. "Time (s): 30" on the line above each grid',
    );
    const many: string[] = [];
    for (let i = 0; i <= 500; i++) many.push(`Time (s): ${i}`, ...grid(8, 12, () => 1));
    expect(texts(parse(many.join("\n")))).toEqual([
      "plate-07.csv line 2: file has more than 500 plate grids (reads); the limit is 500",
    ]);
  });
});

describe("whole-file problems", () => {
  it("refuses empty, binary, oversized, legacy .xls and no-data files", async () => {
    const p = (bytes: Uint8Array, name: string) => parseReaderExport(bytes, name).then(texts);
    expect(await p(new Uint8Array(0), "empty.csv")).toEqual(["empty.csv: file is empty"]);
    expect(await p(enc.encode(" \n\n  \n"), "blank.csv")).toEqual(["blank.csv: file is empty"]);
    const binary = new Uint8Array(4096).map((_, i) => (i * 7919) % 256);
    expect(await p(binary, "garbage.csv")).toEqual([
      "garbage.csv: file is not a CSV, TSV or XLSX export (it looks like binary data)",
    ]);
    expect(await p(new Uint8Array(25 * 1024 * 1024 + 1).fill(65), "big.csv")).toEqual([
      "big.csv: file is 25.0 MB; the limit is 25 MB",
    ]);
    expect(await p(Uint8Array.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, 0, 0]), "old.xls")).toEqual([
      "old.xls: file is a legacy .xls workbook; save it as .xlsx or CSV",
    ]);
    expect(await p(enc.encode("well,value\nA1,1\n"), "fake.xlsx")).toEqual([
      "fake.xlsx: file is named .xlsx but is not an XLSX workbook",
    ]);
    expect(await p(enc.encode("hello\nworld\n"), "notes.csv")).toEqual([
      'notes.csv: no plate data found: expected a header row "well,value" or "well,time_s,value", or a plate grid with column numbers 1–12, 1–24 or 1–48 across and row letters down',
    ]);
    const zipHead = Uint8Array.from([
      0x50, 0x4b, 0x03, 0x04, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20,
    ]);
    expect(await p(zipHead, "broken.xlsx")).toEqual([
      "broken.xlsx: file is not a readable XLSX workbook (damaged zip)",
    ]);
  });

  it("decodes UTF-8 with a BOM and UTF-16LE with a BOM", async () => {
    const text = "well,value\nA1,1\n";
    const bom8 = Uint8Array.from([0xef, 0xbb, 0xbf, ...enc.encode(text)]);
    expect((await parseReaderExport(bom8, "a.csv")).ok).toBe(true);
    const u16 = new Uint8Array(2 + text.length * 2);
    u16[0] = 0xff;
    u16[1] = 0xfe;
    for (let i = 0; i < text.length; i++) u16[2 + 2 * i] = text.charCodeAt(i);
    expect((await parseReaderExport(u16, "a.csv")).ok).toBe(true);
  });
});

describe("XLSX", () => {
  async function workbook(fill: (ws: ExcelJS.Worksheet) => void): Promise<Uint8Array> {
    const wb = new ExcelJS.Workbook();
    fill(wb.addWorksheet("Results"));
    return new Uint8Array(await wb.xlsx.writeBuffer());
  }

  it("reads a kinetic grid from the first sheet, times as text or as a time cell", async () => {
    const bytes = await workbook((ws) => {
      for (let t = 0; t < 3; t++) {
        ws.addRow(t === 1 ? ["Time", new Date(Date.UTC(1899, 11, 30, 0, 0, 30))] : [`Time (s): ${t * 30}`]);
        for (const line of grid(8, 12, (r, c) => t + r + c))
          ws.addRow(line.split(",").map((x, i) => (i > 0 && x !== "" ? Number(x) : x)));
      }
    });
    const r = await parseReaderExport(bytes, "run.xlsx");
    if (!r.ok || r.export.shape !== "grid-kinetic") throw new Error(texts(r).join("; "));
    expect(r.export.timesS).toEqual([0, 30, 60]);
    expect(r.export.wells.get("H12")!.map((p) => p.value)).toEqual([18, 19, 20]);
    expect(r.export.preview.source).toBe('XLSX, sheet "Results"');
  });

  it("names the cell of a bad value and refuses formulas", async () => {
    const bytes = await workbook((ws) => {
      ws.addRow(["well", "value"]);
      ws.addRow(["A1", 1]);
      ws.addRow(["B3", "abc"]);
      ws.addRow(["B4", { formula: "1+1", result: 2 }]);
    });
    expect(texts(await parseReaderExport(bytes, "run.xlsx"))).toEqual([
      'run.xlsx cell B3, well B3: "abc" is not a number',
      'run.xlsx cell B4: "=1+1" starts with "=", which a spreadsheet may run as a formula; text like this is refused',
    ]);
  });
});
