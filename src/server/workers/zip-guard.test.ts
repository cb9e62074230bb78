// The zip guard counts the bytes that really inflate, not the sizes a zip declares, and stops at
// the row and column caps while inflating. Archives are generated (src/test/hostile-corpus.ts,
// INVENTED content); the layout is PKWARE's APPNOTE 4.3, the checksums node:zlib's CRC-32.
import { describe, expect, it } from "vitest";
import ExcelJS from "exceljs";
import { zip } from "@/test/hostile-corpus";
import { guardXlsxZip } from "./zip-guard";

const limits = { maxInflatedBytes: 10 * 1024 * 1024, maxRows: 1000, maxColumns: 50 };
const enc = (s: string) => new TextEncoder().encode(s);
const sheet = (body: string) => enc(`<?xml version="1.0"?><worksheet><sheetData>${body}</sheetData></worksheet>`);

describe("guardXlsxZip", () => {
  it("passes a workbook written by exceljs and reports its rows and columns", async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet("Plate");
    for (let r = 0; r < 20; r++) ws.addRow(Array.from({ length: 12 }, (_, c) => r * 12 + c));
    const r = await guardXlsxZip(new Uint8Array(await wb.xlsx.writeBuffer()), limits);
    expect(r).toMatchObject({ ok: true, rows: 20, columns: 12 });
  });

  it("refuses an entry that inflates past the cap whatever size it declares", async () => {
    const payload = new Uint8Array(11 * 1024 * 1024);
    for (const declaredSize of [payload.byteLength, 100]) {
      const r = await guardXlsxZip(zip([{ name: "xl/media/pad.bin", data: payload, declaredSize }]), limits);
      expect(r).toEqual({ ok: false, message: "workbook inflates beyond 10 MB; the limit guards against zip bombs" });
    }
  });

  it("stops at the row cap and the column cap while inflating", async () => {
    const rows = await guardXlsxZip(
      zip([{ name: "xl/worksheets/sheet1.xml", data: sheet('<row r="1"/>'.repeat(1001)) }]),
      limits,
    );
    expect(rows).toEqual({ ok: false, message: "worksheet sheet1.xml has more than 1000 rows" });
    const byRef = await guardXlsxZip(
      zip([{ name: "xl/worksheets/sheet1.xml", data: sheet('<row r="1"><c r="AZ1"><v>1</v></c></row>') }]),
      limits,
    );
    expect(byRef).toEqual({ ok: false, message: "worksheet sheet1.xml has more than 50 columns" });
    const byCount = await guardXlsxZip(
      zip([{ name: "xl/worksheets/sheet1.xml", data: sheet("<row>" + "<c><v>1</v></c>".repeat(51) + "</row>") }]),
      limits,
    );
    expect(byCount).toEqual({ ok: false, message: "worksheet sheet1.xml has more than 50 columns" });
  });

  it("counts tags split across inflate chunks once", async () => {
    // 256 KB chunks: 200,000 rows of 13 bytes cut many tags in two.
    const r = await guardXlsxZip(
      zip([{ name: "xl/worksheets/sheet1.xml", data: sheet('<row r="1"/>'.repeat(200_000)) }]),
      {
        ...limits,
        maxRows: 1_000_000,
      },
    );
    expect(r).toMatchObject({ ok: true, rows: 200_000 });
  });

  it("refuses damaged archives with a sentence", async () => {
    const good = zip([{ name: "a.xml", data: enc("<a/>") }]);
    expect(await guardXlsxZip(good.subarray(0, 10), limits)).toMatchObject({ ok: false });
    expect(await guardXlsxZip(zip([{ name: "a.xml", data: enc("<a/>"), declaredCrc: 1 }]), limits)).toEqual({
      ok: false,
      message: "file is not a readable XLSX workbook (damaged zip: a.xml fails its CRC-32 check)",
    });
    const noise = zip([{ name: "a.xml", deflated: new Uint8Array([0xff, 0xff, 0xff, 0xff]), crc: 0, rawSize: 10 }]);
    expect(await guardXlsxZip(noise, limits)).toMatchObject({ ok: false });
  });
});
