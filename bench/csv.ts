/**
 * The one CSV reader (src/lib/csv/read.ts) against exceljs's CSV reader, the spreadsheet package
 * of the stack: `npm run bench -- csv`. Files are simulated (INVENTED values) in memory; each case
 * is read 3 times to warm up, then timed (median of 9 runs; exceljs of 3, it is slow).
 */
import { Readable } from "node:stream";
import ExcelJS from "exceljs";
import { readCsv } from "../src/lib/csv/read";
import { readDoseResponseCsv } from "../src/lib/kinetics/table-input";
import { writeLongKinetic } from "../src/lib/plates/export-writers";
import { allWells, type PlateFormat } from "../src/lib/plates/geometry";

function longKinetic(format: PlateFormat, reads: number): string {
  const timesS = Array.from({ length: reads }, (_, k) => k * 10);
  const wells = new Map(
    allWells(format).map((w, i) => [w, timesS.map((t) => Number((200 + 0.8 * t + (i % 7)).toFixed(1)))]),
  );
  return writeLongKinetic(timesS, wells);
}

function doseResponse(curves: number, quoted: boolean): string {
  const q = (s: string | number) => (quoted ? `"${s}"` : String(s));
  const lines = [["compound", "concentration", "response"].map(q).join(",")];
  for (let c = 0; c < curves; c++)
    for (let k = 0; k < 10; k++)
      lines.push([`INV-${c}`, (0.001 * 3 ** k).toPrecision(6), (100 / (1 + 3 ** k / 50)).toFixed(4)].map(q).join(","));
  return lines.join(quoted ? "\r\n" : "\n") + "\n";
}

async function time(label: string, text: string, read: () => unknown, runs = 9): Promise<void> {
  for (let i = 0; i < Math.min(3, runs); i++) await read();
  const ms: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await read();
    ms.push(performance.now() - t0);
  }
  ms.sort((a, b) => a - b);
  const kb = (text.length / 1024).toFixed(0).padStart(6);
  console.log(`${label.padEnd(58)} ${kb} KB  median ${ms[ms.length >> 1]!.toFixed(1).padStart(8)} ms`);
}

async function viaExceljs(text: string): Promise<number> {
  const ws = await new ExcelJS.Workbook().csv.read(Readable.from([text]));
  return ws.rowCount;
}

console.log(`node ${process.version}; load average ${(await import("node:os")).loadavg()[0]!.toFixed(1)}`);
const kinetic384 = longKinetic(384, 60);
await time("384-well × 60 reads, long CSV: exceljs 4.4 csv.read", kinetic384, () => viaExceljs(kinetic384), 3);
await time("384-well × 60 reads, long CSV: readCsv", kinetic384, () => readCsv(kinetic384));
const kinetic1536 = longKinetic(1536, 500);
await time("1536-well × 500 reads (the 25 MB limit's worth): readCsv", kinetic1536, () => readCsv(kinetic1536));
const plain = doseResponse(10_000, false);
await time("10⁵-row dose-response file, unquoted: readDoseResponseCsv", plain, () => readDoseResponseCsv(plain));
const quoted = doseResponse(10_000, true);
await time("10⁵-row dose-response file, quoted CRLF: readDoseResponseCsv", quoted, () => readDoseResponseCsv(quoted));
