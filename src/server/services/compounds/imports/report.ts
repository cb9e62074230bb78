import "server-only";
import { toCsv, type CsvValue } from "@/lib/csv/write";
import type { ImportJob, ImportPreview, ImportResult } from "./types";

const HEADER = ["record", "line", "outcome", "registry_id", "name", "field", "reason"];

/**
 * The downloadable report: one line per record that was registered (with its registry ID) or
 * not (with the field and the reason). Before the commit it lists the preview's problems (as stored:
 * capped, with a last line counting those not kept). Written
 * by the one CSV writer (CRLF, formula-like text neutralised).
 */
export function importReportCsv(job: ImportJob): string {
  const result = job.result as ImportResult | null;
  const preview = job.preview as ImportPreview | null;
  type Line = { record: number; cells: CsvValue[] };
  const out: Line[] = [];
  if (result) {
    for (const r of result.registered)
      out.push({ record: r.record, cells: [r.record, r.line, "registered", r.registryId, r.name, "", ""] });
    for (const n of result.notRegistered)
      out.push({ record: n.record, cells: [n.record, n.line, "not registered", "", "", n.field, n.reason] });
  } else if (preview) {
    for (const i of preview.issues)
      out.push({
        record: i.record,
        cells: [i.record, i.line, "problem (not yet registered)", "", "", i.field, i.message],
      });
  }
  out.sort((a, b) => a.record - b.record);
  // Problems past the stored caps were counted, not kept: the report says so on its last line.
  const notKept = result ? (result.notListed ?? 0) : (preview?.issuesNotStored ?? 0);
  const cells = out.map((l) => l.cells);
  if (notKept > 0)
    cells.push([
      "",
      "",
      "problems not stored",
      "",
      "",
      "",
      `${notKept} more problem${notKept === 1 ? "" : "s"} were found but not stored (too many to keep); fix the ones listed and upload the file again.`,
    ]);
  return toCsv(HEADER, cells, { eol: "\r\n" });
}
