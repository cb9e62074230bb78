import "server-only";
import ExcelJS from "exceljs";
import { triageLabels, type TriageStatus } from "@/lib/hits/query";
import type { HitItem } from "./hits";

/**
 * Export of the hit grid's current view. Numbers stay numbers (concentrations in µM, units in
 * the headers); text that a spreadsheet would read as a formula is neutralised.
 */

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
  { header: "Triage status", value: (r) => triageLabels[r.status as TriageStatus] ?? r.status, width: 12 },
  { header: "Owner", value: (r) => r.owner, width: 20 },
  { header: "Last tested (UTC)", value: (r) => r.lastTested, width: 22 },
  { header: "Comments", value: (r) => r.comments },
];

/**
 * A text cell that starts with = + - @, a tab or a carriage return is prefixed with a single
 * quote, so a spreadsheet shows it as text instead of running it as a formula (OWASP, "CSV
 * Injection"). Numbers are never touched: a negative LipE stays a number.
 */
export function neutralise(v: Cell): Cell {
  if (typeof v !== "string") return v;
  return /^[=+\-@\t\r]/.test(v) ? `'${v}` : v;
}

/** RFC 4180 quoting: a field with a comma, quote, CR or LF is quoted and quotes doubled. */
function csvField(v: Cell): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return Number.isFinite(v) ? String(v) : "";
  const s = String(v);
  return /[",\r\n]/.test(s) || s !== s.trim() ? `"${s.replace(/"/g, '""')}"` : s;
}

export function hitsCsv(items: HitItem[]): string {
  const lines = [exportColumns.map((c) => csvField(c.header)).join(",")];
  for (const r of items) lines.push(exportColumns.map((c) => csvField(neutralise(c.value(r)))).join(","));
  return `${lines.join("\r\n")}\r\n`;
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
  for (const r of items) ws.addRow(exportColumns.map((c) => neutralise(c.value(r))));
  const about = wb.addWorksheet("About");
  const notes = [
    ["Campaign", meta.campaignName],
    ["Exported", new Date().toISOString()],
    ["Exported by", meta.exportedBy],
    ["View (sort and filters)", meta.query || "default ranked order, no filters"],
    ["Rows", items.length],
    ...(meta.truncated
      ? [["Note", `Only the first ${items.length} rows of the view are exported; narrow the filters for the rest.`]]
      : []),
    [
      "Units",
      "Concentrations (Ki, Kic, Kiu, IC50) in µM; MW in g/mol; LE in kcal/mol per heavy atom at 298 K; LipE = pKi − cLogP.",
    ],
    [
      "Caution",
      "Research use only. Potency and mechanism calls depend on assay conditions and must be reviewed by a qualified scientist before decisions; rows with flags are not clean fits.",
    ],
  ] as [string, Cell][];
  for (const [k, v] of notes) about.addRow([k, neutralise(v)]);
  about.getColumn(1).width = 26;
  about.getColumn(2).width = 100;
  return Buffer.from(await wb.xlsx.writeBuffer());
}
