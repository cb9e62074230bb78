/**
 * Column headers (CSV, XLSX) and SDF data-field names → registry fields, and raw field values →
 * a checked import record.
 *
 * Headers are matched case-insensitively after normalisation: µ/μ → u, every run of characters
 * other than letters and digits → "_", leading/trailing "_" dropped. So "Purity (%)" → `purity`,
 * "Amount (mg)" → `amount_mg`, "Volume (µL)" → `volume_ul`.
 *
 * Accepted names (first = canonical; the others are synonyms):
 *
 * | field | accepted headers |
 * |---|---|
 * | smiles | smiles, structure, canonical_smiles |
 * | molfile | molfile, mol (a quoted multi-line cell) |
 * | name | name, compound_name, compound |
 * | aliases | aliases, alias, synonyms, supplier_code, supplier_codes (several separated by ";") |
 * | supplier | supplier, vendor |
 * | purity_pct | purity_pct, purity, purity_percent |
 * | amount | amount (needs amount_unit) |
 * | amount_mg | amount_mg (amount in mg, no unit column needed) |
 * | amount_unit | amount_unit, unit (µg, mg, g, µL, mL; ug, mcg, ul accepted) |
 * | salt_form | salt_form, salt, solvate, salt_or_solvate |
 * | batch_date | batch_date, date, received (YYYY-MM-DD) |
 * | batch_notes | batch_notes, notes |
 * | stock_concentration_mm | stock_concentration_mm, stock_conc_mm, concentration_mm, conc_mm |
 * | stock_solvent | stock_solvent, solvent |
 * | stock_volume_ul | stock_volume_ul, volume_ul |
 * | stock_location | stock_location, location |
 * | stock_date | stock_date |
 *
 * Any other column is ignored and listed in `ignoredFields`.
 */
import { type ImportIssue, type ImportRecord } from "./import-types";
import { importRecordSchema } from "./validation";

export const CANONICAL_FIELDS = [
  "smiles",
  "molfile",
  "name",
  "aliases",
  "supplier",
  "purity_pct",
  "amount",
  "amount_mg",
  "amount_unit",
  "salt_form",
  "batch_date",
  "batch_notes",
  "stock_concentration_mm",
  "stock_solvent",
  "stock_volume_ul",
  "stock_location",
  "stock_date",
] as const;
export type CanonicalField = (typeof CANONICAL_FIELDS)[number];

const SYNONYMS: Record<string, CanonicalField> = {
  structure: "smiles",
  canonical_smiles: "smiles",
  mol: "molfile",
  compound_name: "name",
  compound: "name",
  alias: "aliases",
  synonyms: "aliases",
  supplier_code: "aliases",
  supplier_codes: "aliases",
  vendor: "supplier",
  purity: "purity_pct",
  purity_percent: "purity_pct",
  unit: "amount_unit",
  salt: "salt_form",
  solvate: "salt_form",
  salt_or_solvate: "salt_form",
  date: "batch_date",
  received: "batch_date",
  notes: "batch_notes",
  stock_conc_mm: "stock_concentration_mm",
  concentration_mm: "stock_concentration_mm",
  conc_mm: "stock_concentration_mm",
  solvent: "stock_solvent",
  volume_ul: "stock_volume_ul",
  location: "stock_location",
};

export function normaliseHeader(header: string): string {
  return header
    .toLowerCase()
    .replace(/[µμ]/g, "u")
    .replace(/[^a-z0-9]+/g, "_")
    .replace(/^_+|_+$/g, "");
}

export function canonicalField(header: string): CanonicalField | undefined {
  const h = normaliseHeader(header);
  if ((CANONICAL_FIELDS as readonly string[]).includes(h)) return h as CanonicalField;
  return SYNONYMS[h];
}

/** zod path (from importRecordSchema) → canonical field, for messages that name the file's column. */
const PATH_TO_FIELD: Record<string, CanonicalField> = {
  smiles: "smiles",
  molfile: "molfile",
  name: "name",
  aliases: "aliases",
  "batch.supplier": "supplier",
  "batch.purityPct": "purity_pct",
  "batch.amount": "amount",
  "batch.amountUnit": "amount_unit",
  "batch.saltForm": "salt_form",
  "batch.date": "batch_date",
  "batch.notes": "batch_notes",
  "stock.concentrationMm": "stock_concentration_mm",
  "stock.solvent": "stock_solvent",
  "stock.volumeUl": "stock_volume_ul",
  "stock.location": "stock_location",
  "stock.date": "stock_date",
};

export type RawFields = Partial<Record<CanonicalField, string>>;

/**
 * Checks one record's raw values. `labels` maps canonical fields to the header text used in the
 * file, so messages name the column the chemist sees.
 */
export function checkRecord(
  recordNo: number,
  line: number,
  raw: RawFields,
  labels: Partial<Record<CanonicalField, string>>,
): { record?: ImportRecord; issues: ImportIssue[] } {
  const v = (f: CanonicalField) => {
    const s = raw[f];
    if (s === undefined || s.trim() === "") return undefined;
    // A date-typed spreadsheet cell arrives as a midnight timestamp: keep the calendar date.
    if ((f === "batch_date" || f === "stock_date") && /^\d{4}-\d{2}-\d{2}T00:00:00(\.0+)?Z$/.test(s.trim())) {
      return s.trim().slice(0, 10);
    }
    return s;
  };
  const batchRaw = {
    supplier: v("supplier"),
    purityPct: v("purity_pct"),
    amount: v("amount") ?? v("amount_mg"),
    amountUnit: v("amount_unit") ?? (v("amount") === undefined && v("amount_mg") !== undefined ? "mg" : undefined),
    saltForm: v("salt_form"),
    date: v("batch_date"),
    notes: v("batch_notes"),
  };
  const stockRaw = {
    concentrationMm: v("stock_concentration_mm"),
    solvent: v("stock_solvent"),
    volumeUl: v("stock_volume_ul"),
    location: v("stock_location"),
    date: v("stock_date"),
  };
  const any = (o: Record<string, unknown>) => Object.values(o).some((x) => x !== undefined);
  const input = {
    smiles: v("smiles"),
    molfile: v("molfile"),
    name: v("name"),
    aliases: v("aliases"),
    batch: any(batchRaw) ? batchRaw : undefined,
    stock: any(stockRaw) ? stockRaw : undefined,
  };
  const parsed = importRecordSchema.safeParse(input);
  if (parsed.success) {
    const d = parsed.data;
    const record: ImportRecord = { recordNo, line };
    if (d.smiles !== undefined) record.smiles = d.smiles;
    if (d.molfile !== undefined) record.molfile = d.molfile;
    if (d.name !== undefined) record.name = d.name;
    if (d.aliases !== undefined && d.aliases.length > 0) record.aliases = d.aliases;
    if (d.batch !== undefined) record.batch = d.batch;
    if (d.stock !== undefined) record.stock = d.stock;
    return { record, issues: [] };
  }
  const issues = parsed.error.issues.map((i) => {
    const path = i.path.map(String);
    const key = path[0] === "aliases" ? "aliases" : path.join(".");
    let field = PATH_TO_FIELD[key];
    if (key === "batch.amount" && v("amount") === undefined) field = "amount_mg";
    const label = field ? (labels[field] ?? field) : key || "record";
    return { record: recordNo, line, field: label, message: i.message };
  });
  return { issues };
}
