/**
 * Import parsers. Names, suppliers and locations in these files are invented; the structures are
 * small common molecules. Expected CSV behaviour follows RFC 4180 (quoted fields, doubled quotes,
 * line breaks inside quotes); CSV-injection rules follow OWASP "CSV Injection".
 */
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { normaliseHeader } from "./import-fields";
import { prepareImport } from "./import-prepare";
import { parseSdfImport } from "./import-sdf";
import { parseCsvImport } from "./import-table";
import { MAX_IMPORT_RECORDS } from "./import-types";
import { parseXlsxImport } from "./import-xlsx";

const goodCsv = [
  "SMILES,Name,Aliases,Supplier,Purity (%),Amount,Amount_Unit,Salt_Form,Stock_Conc_mM,Volume (µL),Location,Colour",
  "CCO,Invented-1,X-1;X-1b,Imaginary Chemicals,99.1,25,mg,,10,500,Freezer 2 / Rack B / A07,blue",
  'c1ccccc1O,"Invented-2, phenol lot",,Imaginary Chemicals,98,10,mg,,,,,',
  "CC(=O)O,Invented-3,,,,,,,,,,",
].join("\r\n");

describe("parseCsvImport", () => {
  it("reads records with case-insensitive headers, units in headers and quoted commas", () => {
    const r = parseCsvImport(goodCsv);
    expect(r.fileErrors).toEqual([]);
    expect(r.issues).toEqual([]);
    expect(r.ignoredFields).toEqual(["Colour"]);
    expect(r.totalRecords).toBe(3);
    expect(r.records[0]).toEqual({
      recordNo: 1,
      line: 2,
      smiles: "CCO",
      name: "Invented-1",
      aliases: ["X-1", "X-1b"],
      batch: { supplier: "Imaginary Chemicals", purityPct: 99.1, amount: 25, amountUnit: "mg" },
      stock: { concentrationMm: 10, volumeUl: 500, location: "Freezer 2 / Rack B / A07" },
    });
    expect(r.records[1]?.name).toBe("Invented-2, phenol lot");
    expect(r.records[2]).toEqual({ recordNo: 3, line: 4, smiles: "CC(=O)O", name: "Invented-3" });
  });

  it("reports exactly the three bad records, with record and line numbers as a chemist counts", () => {
    const csv = [
      "smiles,name,purity_pct",
      "CCO,ok-1,99",
      '"C1CC",bad-structure,99', // bad structure: found in the prepare step
      "CCN,bad-purity,120",
      ",no-structure,90",
      '"CCCl","multi',
      'line name",95', // one record over two lines
      "CCC,=cmd|' /C calc'!A0,95", // formula injection
    ].join("\n");
    const r = parseCsvImport(csv);
    expect(r.issues).toEqual([
      { record: 3, line: 4, field: "purity_pct", message: "Purity (%) must be between 0 and 100." },
      { record: 4, line: 5, field: "smiles", message: "Give a structure: a SMILES or a molfile." },
      {
        record: 6,
        line: 8,
        field: "name",
        message: `"=cmd|' /C calc'!A0" starts with "=", which a spreadsheet may run as a formula; text like this is refused.`,
      },
    ]);
    expect(r.records.map((x) => x.recordNo)).toEqual([1, 2, 5]);
    expect(r.records[2]).toMatchObject({ line: 6, name: "multi\nline name" });
    expect(r.rejected.map((x) => x.recordNo)).toEqual([3, 4, 6]);
    const prep = prepareImport(r.records);
    expect(prep.issues).toEqual([
      {
        record: 2,
        line: 3,
        field: "smiles",
        message: 'SMILES "C1CC" could not be read: unclosed ring: ring bond 1 is opened but never closed.',
      },
    ]);
    expect(prep.prepared.map((p) => p.recordNo)).toEqual([1, 5]);
  });

  it("sniffs semicolon-separated files and reads bytes with a BOM", () => {
    const bytes = new TextEncoder().encode("\uFEFFsmiles;name\nCCO;Invented-A\n");
    const r = parseCsvImport(bytes);
    expect(r.records).toEqual([{ recordNo: 1, line: 2, smiles: "CCO", name: "Invented-A" }]);
  });

  it("names the line of a quote that is never closed instead of reading the rest as one cell", () => {
    const r = parseCsvImport('smiles,name\nCCO,"Invented-A\nCCN,Invented-B\n');
    expect(r.fileErrors).toEqual(["Line 2: a quoted cell is not closed; nothing after it can be read."]);
    expect(r.records).toEqual([]);
  });

  it("needs a structure column", () => {
    expect(parseCsvImport("name,purity\nx,1\n").fileErrors[0]).toMatch(/No structure column/);
  });

  it("refuses two columns with the same meaning", () => {
    expect(parseCsvImport("smiles,structure\nC,C\n").fileErrors[0]).toMatch(/both mean smiles/);
  });

  it(`caps the file at ${MAX_IMPORT_RECORDS} records`, () => {
    const rows = ["smiles", ...Array.from({ length: MAX_IMPORT_RECORDS + 1 }, () => "C")];
    const r = parseCsvImport(rows.join("\n"));
    expect(r.fileErrors[0]).toMatch(/10,001 records; the limit is 10,000/);
    expect(r.records).toEqual([]);
  });

  it("caps the size at 25 MB", () => {
    expect(parseCsvImport(new Uint8Array(25 * 1024 * 1024 + 1)).fileErrors[0]).toMatch(/larger than 25 MB/);
  });

  it("accepts amount_mg without a unit column", () => {
    const r = parseCsvImport("smiles,Amount (mg)\nCCO,12.5\n");
    expect(r.records[0]?.batch).toEqual({ amount: 12.5, amountUnit: "mg" });
  });
});

describe("normaliseHeader", () => {
  it.each([
    ["Purity (%)", "purity"],
    ["Volume (µL)", "volume_ul"],
    ["  SMILES ", "smiles"],
    ["Stock conc. (mM)", "stock_conc_mm"],
  ])("%j → %s", (h, n) => expect(normaliseHeader(h)).toBe(n));
});

describe("prepareImport", () => {
  it("reports duplicate structures inside the file, and stereo forms as warnings", () => {
    const r = parseCsvImport(
      ["smiles,name", "CC(=O)Oc1ccccc1C(O)=O,a", "OC(=O)c1ccccc1OC(C)=O,b", "C[C@H](N)C(=O)O,c", "CC(N)C(=O)O,d"].join(
        "\n",
      ),
    );
    const prep = prepareImport(r.records);
    expect(prep.issues).toEqual([
      { record: 2, line: 3, field: "smiles", message: "Same structure as record 1 (line 2)." },
    ]);
    expect(prep.warnings).toEqual([
      {
        record: 4,
        line: 5,
        field: "smiles",
        message: "Another stereo form of record 3 (line 4); both will be registered.",
      },
    ]);
    expect(prepareImport(r.records, { duplicates: "warn" }).prepared).toHaveLength(4);
  });

  it("moves a counter-ion into the batch's salt form", () => {
    const r = parseCsvImport("smiles,name\nCCN(CC)CC.Cl,Invented-salt\n");
    const prep = prepareImport(r.records);
    expect(prep.prepared[0]?.batch?.saltForm).toBe("Cl");
    expect(prep.prepared[0]?.properties.formula).toBe("C6H15N");
    expect(prep.prepared[0]?.fingerprintBits).toMatch(/^[01]{1024}$/);
  });
});

const ethanolMolfile = [
  "Invented-SDF-1",
  "  hand-written",
  "",
  "  3  2  0  0  0  0  0  0  0  0999 V2000",
  "    0.0000    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0",
  "    1.2990    0.7500    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0",
  "    2.5981    0.0000    0.0000 O   0  0  0  0  0  0  0  0  0  0  0  0",
  "  1  2  1  0  0  0  0",
  "  2  3  1  0  0  0  0",
  "M  END",
];

describe("parseSdfImport", () => {
  it("reads records, data items and the title line as the name", () => {
    const sdf = [
      ...ethanolMolfile,
      ">  <Supplier>",
      "Imaginary Chemicals",
      "",
      "> <PURITY_PCT> (1)",
      "97.5",
      "",
      "> <Registry note>",
      "ignored",
      "",
      "$$$$",
      ...ethanolMolfile.map((l, i) => (i === 0 ? "" : l)),
      "> <name>",
      "Invented-SDF-2",
      "",
      "> <purity>",
      "150",
      "",
      "$$$$",
      "",
    ].join("\n");
    const r = parseSdfImport(sdf);
    expect(r.totalRecords).toBe(2);
    expect(r.records).toHaveLength(1);
    expect(r.records[0]).toMatchObject({
      recordNo: 1,
      line: 1,
      name: "Invented-SDF-1",
      batch: { supplier: "Imaginary Chemicals", purityPct: 97.5 },
    });
    expect(r.records[0]?.molfile).toMatch(/M {2}END$/);
    expect(r.issues).toEqual([
      { record: 2, line: 21, field: "purity", message: "Purity (%) must be between 0 and 100." },
    ]);
    expect(r.ignoredFields).toEqual(["Registry note"]);
    expect(prepareImport(r.records).prepared[0]?.properties.formula).toBe("C2H6O");
  });

  it("reports a file with no records", () => {
    expect(parseSdfImport("\n\n").fileErrors).toEqual(["The file contains no SDF records."]);
  });
});

describe("parseXlsxImport (workbook written with exceljs)", () => {
  async function workbook(rows: unknown[][]): Promise<Uint8Array> {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet("Compounds");
    rows.forEach((r) => ws.addRow(r));
    return new Uint8Array(await wb.xlsx.writeBuffer());
  }

  it("reads typed cells and refuses formulas", async () => {
    const bytes = await workbook([
      ["SMILES", "Name", "Purity", "Date"],
      ["CCO", "Invented-X1", 99.5, new Date(Date.UTC(2025, 2, 14))],
      ["CCN", { formula: "1+1", result: 2 }, 98, null],
    ]);
    const r = await parseXlsxImport(bytes);
    expect(r.records).toEqual([
      { recordNo: 1, line: 2, smiles: "CCO", name: "Invented-X1", batch: { purityPct: 99.5, date: "2025-03-14" } },
    ]);
    expect(r.issues).toHaveLength(1);
    expect(r.issues[0]).toMatchObject({ record: 2, line: 3, field: "Name" });
    expect(r.issues[0]?.message).toMatch(/starts with "="/);
  });

  it("explains a file that is not a workbook", async () => {
    const r = await parseXlsxImport(new TextEncoder().encode("smiles\nCCO\n"));
    expect(r.fileErrors[0]).toMatch(/^The file is not a readable XLSX workbook/);
  });
});
