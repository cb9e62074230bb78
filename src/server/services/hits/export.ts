import "server-only";
import ExcelJS from "exceljs";
import { db } from "@/server/db/client";
import { hitRows } from "@/server/db/schema";
import { neutraliseFormula, toCsv } from "@/lib/csv/write";
import { triageLabels, type HitFilter } from "@/lib/hits/query";
import { hitJson, orderOf, rowColumns, whereOf, type HitItem } from "./list";

/**
 * Export of the hit grid's current view. Numbers stay numbers (concentrations in µM, units in
 * the headers); text that a spreadsheet would read as a formula is neutralised.
 */

export const EXPORT_MAX_ROWS = 100_000;

/** Every row of the view (same filter and order as the grid), up to EXPORT_MAX_ROWS. */
export async function exportHits(campaignId: string, f: HitFilter): Promise<{ items: HitItem[]; truncated: boolean }> {
  const rows = await db
    .select(rowColumns)
    .from(hitRows)
    .where(whereOf(campaignId, f))
    .orderBy(orderOf(f))
    .limit(EXPORT_MAX_ROWS + 1);
  return { items: rows.slice(0, EXPORT_MAX_ROWS).map(hitJson), truncated: rows.length > EXPORT_MAX_ROWS };
}

type Cell = string | number | boolean | null;
type Column = { header: string; value: (r: HitItem) => Cell; width?: number };

export const exportColumns: Column[] = [
  { header: "Registry ID", value: (r) => r.registryId, width: 14 },
  { header: "Name", value: (r) => r.name, width: 24 },
  { header: "Mechanism", value: (r) => r.mechanism, width: 16 },
  { header: "Mechanism call", value: (r) => r.mechanismLabel, width: 12 },
  { header: "Ki (µM)", value: (r) => r.ki },
  { header: "Ki 95 % CI low (µM)", value: (r) => r.kiCi95[0] },
  { header: "Ki 95 % CI high (µM)", value: (r) => r.kiCi95[1] },
  { header: "Kic (µM)", value: (r) => r.kic },
  { header: "Kiu (µM)", value: (r) => r.kiu },
  { header: "α = Kiu/Kic", value: (r) => r.alpha },
  { header: "IC50 qualifier", value: (r) => r.ic50Qualifier, width: 8 },
  { header: "IC50 (µM)", value: (r) => r.ic50 },
  { header: "IC50 95 % CI low (µM)", value: (r) => r.ic50Ci95[0] },
  { header: "IC50 95 % CI high (µM)", value: (r) => r.ic50Ci95[1] },
  { header: "Hill slope", value: (r) => r.hill },
  { header: "Single-dose inhibition (%)", value: (r) => r.pctInhibition },
  { header: "Hit (single dose)", value: (r) => (r.hit === null ? null : r.hit ? "yes" : "no"), width: 8 },
  { header: "pKi", value: (r) => r.pKi },
  { header: "LE (kcal/mol per heavy atom)", value: (r) => r.le },
  { header: "LipE (pKi − cLogP)", value: (r) => r.lipe },
  { header: "MW (g/mol)", value: (r) => r.mw },
  { header: "cLogP", value: (r) => r.clogp },
  { header: "Heavy atoms", value: (r) => r.heavyAtoms },
  { header: "Flags", value: (r) => r.flags.join("; "), width: 30 },
  { header: "Triage status", value: (r) => triageLabels[r.status] ?? r.status, width: 12 },
  { header: "Owner", value: (r) => r.owner, width: 20 },
  { header: "Last tested (UTC)", value: (r) => r.lastTested, width: 22 },
  { header: "Comments", value: (r) => r.comments },
];

/**
 * The view as CSV (RFC 4180, CRLF): the header as it is, data cells through the one
 * formula-injection rule of src/lib/csv/write.ts; numbers stay numbers (a negative LipE too).
 */
export function hitsCsv(items: HitItem[]): string {
  return toCsv(
    exportColumns.map((c) => c.header),
    items.map((r) => exportColumns.map((c) => c.value(r))),
    { eol: "\r\n", neutralise: true },
  );
}

export async function hitsXlsx(
  items: HitItem[],
  meta: { campaignName: string; query: string; truncated: boolean; exportedBy: string },
): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = "Inhibitrack";
  wb.created = new Date();
  const ws = wb.addWorksheet("Hits", { views: [{ state: "frozen", ySplit: 1, xSplit: 1 }] });
  ws.columns = exportColumns.map((c) => ({ header: c.header, width: c.width ?? Math.max(10, c.header.length + 2) }));
  ws.getRow(1).font = { bold: true };
  for (const r of items) ws.addRow(exportColumns.map((c) => neutraliseFormula(c.value(r))));
  const about = wb.addWorksheet("About");
  const truncation: [string, Cell][] = meta.truncated
    ? [["Note", `Only the first ${items.length} rows of the view are exported; narrow the filters for the rest.`]]
    : [];
  const notes: [string, Cell][] = [
    ["Campaign", meta.campaignName],
    ["Exported", new Date().toISOString()],
    ["Exported by", meta.exportedBy],
    ["View (sort and filters)", meta.query || "default ranked order, no filters"],
    ["Rows", items.length],
    ...truncation,
    [
      "Units",
      "Concentrations (Ki, Kic, Kiu, IC50) in µM; MW in g/mol; LE in kcal/mol per heavy atom at 298 K; LipE = pKi − cLogP.",
    ],
    [
      "Caution",
      "Research use only. Potency and mechanism calls depend on assay conditions and must be reviewed by a qualified scientist before decisions; rows with flags are not clean fits.",
    ],
  ];
  for (const [k, v] of notes) about.addRow([k, neutraliseFormula(v)]);
  about.getColumn(1).width = 26;
  about.getColumn(2).width = 100;
  return Buffer.from(await wb.xlsx.writeBuffer());
}
