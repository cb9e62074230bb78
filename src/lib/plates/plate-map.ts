/**
 * The plate map: what is in each well of a plate, with CSV import and export.
 *
 * CSV columns: `well,role,compound,concentration_uM,substrate_uM,group` (header names
 * case-insensitive, any order; `well` and `role` required). Wells not listed are `empty`.
 * Roles: `sample`, `neutral` (0 % inhibition), `full` (100 % inhibition), `blank`, `empty`.
 * Export writes canonical well names (`A1`, or `A01` with `padded`) in row-major order and lists
 * only wells that are not empty.
 */
import { z } from "zod";
import { toCsv } from "@/lib/csv/write";
import { formulaInjectionMessage, parseNumber } from "./cells";
import {
  allWells,
  fitsFormat,
  indexOfWell,
  isPlateFormat,
  paddedWellName,
  parseWellName,
  positionOfIndex,
  type PlateFormat,
  wellIndex,
  wellName,
} from "./geometry";
import { issue, MAX_ISSUES, type PlateIssue, quoteCell } from "./issues";
import { decodeText, readTextTable, sniffDelimiter } from "./text-table";

export const WELL_ROLES = ["sample", "neutral", "full", "blank", "empty"] as const;
export type WellRole = (typeof WELL_ROLES)[number];

/** At least this many wells of each control (neutral and full) on a plate map. */
export const MIN_CONTROL_WELLS = 4;

export interface PlateMapWell {
  /** canonical name, e.g. `B3` */
  readonly well: string;
  readonly role: WellRole;
  /** registry ID such as `INH-000123`, optionally with a batch suffix the server resolves */
  readonly compound?: string;
  readonly concentrationUm?: number;
  readonly substrateUm?: number;
  /** replicate group: wells with the same group are replicates */
  readonly group?: string;
}

/** A plate map holds every well of its format, indexed row-major (`wells[indexOfWell(name)]`). */
export interface PlateMap {
  readonly format: PlateFormat;
  readonly wells: readonly PlateMapWell[];
}

export const PLATE_MAP_COLUMNS = ["well", "role", "compound", "concentration_uM", "substrate_uM", "group"] as const;

export function emptyPlateMap(format: PlateFormat): PlateMap {
  return { format, wells: allWells(format).map((well) => ({ well, role: "empty" as const })) };
}

/** Build a full plate map from the wells that are listed; all others are empty. */
export function plateMapFromWells(format: PlateFormat, listed: readonly PlateMapWell[]): PlateMap {
  const wells: PlateMapWell[] = [...emptyPlateMap(format).wells];
  for (const w of listed) {
    const idx = indexOfWell(w.well, format);
    if (idx === undefined) throw new RangeError(`"${w.well}" is not a well of a ${format}-well plate`);
    wells[idx] = { ...w, well: wellNameOfIdx(idx, format) };
  }
  return { format, wells };
}

function wellNameOfIdx(idx: number, format: PlateFormat): string {
  return wellName(positionOfIndex(idx, format));
}

export function getPlateMapWell(map: PlateMap, name: string): PlateMapWell | undefined {
  const idx = indexOfWell(name, map.format);
  return idx === undefined ? undefined : map.wells[idx];
}

export function countRoles(map: PlateMap): Record<WellRole, number> {
  const out: Record<WellRole, number> = { sample: 0, neutral: 0, full: 0, blank: 0, empty: 0 };
  for (const w of map.wells) out[w.role]++;
  return out;
}

/** Problems with one well's contents, independent of where it came from. */
function wellProblems(w: PlateMapWell): string[] {
  const out: string[] = [];
  for (const [label, value] of [
    ["compound", w.compound],
    ["group", w.group],
  ] as const) {
    if (value === undefined) continue;
    const inj = formulaInjectionMessage(value);
    if (inj) out.push(`${label} ${inj}`);
  }
  for (const [label, value] of [
    ["concentration_uM", w.concentrationUm],
    ["substrate_uM", w.substrateUm],
  ] as const) {
    if (value === undefined) continue;
    if (!Number.isFinite(value)) out.push(`${label} is not a finite number`);
    else if (value < 0) out.push(`${label} ${value} is negative`);
  }
  if (w.role === "sample") {
    if (w.compound === undefined || w.compound.trim() === "") out.push("sample well has no compound");
    if (w.concentrationUm === undefined) out.push("sample well has no concentration_uM");
  }
  return out;
}

function controlProblems(map: PlateMap): string[] {
  const counts = countRoles(map);
  const out: string[] = [];
  if (counts.neutral < MIN_CONTROL_WELLS) {
    out.push(`plate map has ${counts.neutral} neutral control wells; at least ${MIN_CONTROL_WELLS} are needed`);
  }
  if (counts.full < MIN_CONTROL_WELLS) {
    out.push(`plate map has ${counts.full} full-inhibition control wells; at least ${MIN_CONTROL_WELLS} are needed`);
  }
  return out;
}

/** Check a plate map built in the editor or received as JSON: the same rules as the CSV import. */
export function validatePlateMap(map: PlateMap): PlateIssue[] {
  const issues: PlateIssue[] = [];
  if (map.wells.length !== map.format) {
    issues.push(issue({}, `plate map has ${map.wells.length} wells; a ${map.format}-well plate needs ${map.format}`));
    return issues;
  }
  map.wells.forEach((w, i) => {
    const expected = wellNameOfIdx(i, map.format);
    if (w.well !== expected) issues.push(issue({ well: w.well }, `well is stored at position ${expected}`));
    for (const m of wellProblems(w)) issues.push(issue({ well: w.well }, m));
  });
  for (const m of controlProblems(map)) issues.push(issue({}, m));
  return issues.slice(0, MAX_ISSUES);
}

export type PlateMapParseResult =
  { readonly ok: true; readonly map: PlateMap } | { readonly ok: false; readonly issues: PlateIssue[] };

/**
 * Import a plate map CSV (text or bytes) for a plate format. Every problem is reported with its
 * line and well (up to 50), and nothing is returned unless the whole file is valid.
 */
export function parsePlateMapCsv(
  input: string | Uint8Array,
  format: PlateFormat,
  fileName?: string,
): PlateMapParseResult {
  const issues: PlateIssue[] = [];
  const at = (line: number | undefined, well: string | undefined, message: string) => {
    if (issues.length < MAX_ISSUES) {
      issues.push(
        issue(
          {
            ...(fileName ? { file: fileName } : {}),
            ...(line !== undefined ? { line } : {}),
            ...(well ? { well } : {}),
          },
          message,
        ),
      );
    }
  };
  if (!isPlateFormat(format)) {
    at(undefined, undefined, `plate format ${String(format)} is not one of 96, 384, 1536`);
    return { ok: false, issues };
  }
  const text = typeof input === "string" ? input : decodeText(input);
  if (text.trim() === "") {
    at(undefined, undefined, "file is empty");
    return { ok: false, issues };
  }
  const table = readTextTable(text, sniffDelimiter(text, fileName));
  if (!table.ok) {
    at(table.line, undefined, table.message);
    return { ok: false, issues };
  }
  const rows = table.rows;
  const header = rows[0];
  if (!header) {
    at(undefined, undefined, "file is empty");
    return { ok: false, issues };
  }
  const cols = new Map<string, number>();
  const known = new Map(PLATE_MAP_COLUMNS.map((c) => [c.toLowerCase(), c]));
  header.cells.forEach((raw, i) => {
    const name = raw.trim().toLowerCase();
    if (name === "" && i === header.cells.length - 1) return; // trailing delimiter
    const canonical = known.get(name);
    if (!canonical)
      at(header.line, undefined, `unknown column ${quoteCell(raw.trim())}; expected ${PLATE_MAP_COLUMNS.join(", ")}`);
    else if (cols.has(canonical)) at(header.line, undefined, `column "${canonical}" appears twice`);
    else cols.set(canonical, i);
  });
  for (const required of ["well", "role"] as const) {
    if (!cols.has(required) && issues.length === 0)
      at(header.line, undefined, `the header has no "${required}" column`);
  }
  if (issues.length > 0) return { ok: false, issues };

  const wells: PlateMapWell[] = [...emptyPlateMap(format).wells];
  const firstLine = new Map<number, number>();
  const get = (cells: string[], col: string) => {
    const i = cols.get(col);
    return i === undefined ? "" : (cells[i] ?? "");
  };
  for (let r = 1; r < rows.length; r++) {
    const { line, cells } = rows[r]!;
    if (cells.length > header.cells.length && cells.slice(header.cells.length).some((c) => c.trim() !== "")) {
      at(line, undefined, `line has ${cells.length} cells but the header has ${header.cells.length}`);
      continue;
    }
    const rawWell = get(cells, "well");
    let injected = false;
    for (const c of cells) {
      const inj = formulaInjectionMessage(c);
      if (inj) {
        at(line, undefined, inj);
        injected = true;
      }
    }
    if (injected) continue;
    if (rawWell.trim() === "") {
      at(line, undefined, "well is missing");
      continue;
    }
    const pos = parseWellName(rawWell);
    if (!pos) {
      at(line, undefined, `${quoteCell(rawWell.trim())} is not a well name`);
      continue;
    }
    if (!fitsFormat(pos, format)) {
      at(line, undefined, `${quoteCell(rawWell.trim())} is not a well of a ${format}-well plate`);
      continue;
    }
    const name = wellName(pos);
    const idx = wellIndex(pos, format);
    const seen = firstLine.get(idx);
    if (seen !== undefined) {
      at(line, name, `well is listed twice (first on line ${seen})`);
      continue;
    }
    firstLine.set(idx, line);
    const roleRaw = get(cells, "role").trim();
    if (roleRaw === "") {
      at(line, name, "role is missing");
      continue;
    }
    const role = WELL_ROLES.find((r) => r === roleRaw.toLowerCase());
    if (role === undefined) {
      at(line, name, `unknown role ${quoteCell(roleRaw)}; use ${WELL_ROLES.join(", ")}`);
      continue;
    }
    let bad = false;
    const num = (col: "concentration_uM" | "substrate_uM"): number | undefined => {
      const raw = get(cells, col).trim();
      if (raw === "") return undefined;
      const v = parseNumber(raw);
      if (v === undefined) {
        at(line, name, `${col} ${quoteCell(raw)} is not a number`);
        bad = true;
      }
      return v;
    };
    const concentrationUm = num("concentration_uM");
    const substrateUm = num("substrate_uM");
    if (bad) continue;
    const compound = get(cells, "compound").trim();
    const group = get(cells, "group").trim();
    const w: PlateMapWell = {
      well: name,
      role,
      ...(compound ? { compound } : {}),
      ...(concentrationUm !== undefined ? { concentrationUm } : {}),
      ...(substrateUm !== undefined ? { substrateUm } : {}),
      ...(group ? { group } : {}),
    };
    const problems = wellProblems(w);
    for (const m of problems) at(line, name, m);
    wells[idx] = w;
  }
  const map: PlateMap = { format, wells };
  if (issues.length === 0) for (const m of controlProblems(map)) at(undefined, undefined, m);
  return issues.length > 0 ? { ok: false, issues } : { ok: true, map };
}

/**
 * Write a plate map as CSV (LF line ends, header first, non-empty wells in row-major order) with
 * the one CSV writer. Formula-like text is refused rather than neutralised: the import refuses
 * it, so an export can always be read back as it was written.
 */
export function plateMapToCsv(map: PlateMap, options: { padded?: boolean } = {}): string {
  const rows: (string | number | undefined)[][] = [];
  map.wells.forEach((w, i) => {
    if (
      w.role === "empty" &&
      w.compound === undefined &&
      w.concentrationUm === undefined &&
      w.substrateUm === undefined &&
      w.group === undefined
    )
      return;
    for (const t of [w.compound, w.group]) {
      const inj = t === undefined ? undefined : formulaInjectionMessage(t);
      if (inj) throw new Error(`well ${w.well}: ${inj}`);
    }
    const pos = positionOfIndex(i, map.format);
    const name = options.padded ? paddedWellName(pos, map.format) : wellName(pos);
    rows.push([name, w.role, w.compound, w.concentrationUm, w.substrateUm, w.group]);
  });
  return toCsv(PLATE_MAP_COLUMNS, rows, { eol: "\n", neutralise: false });
}

/** zod schema for a plate map sent as JSON (e.g. from the editor); run validatePlateMap after. */
export const plateMapWellSchema = z.object({
  well: z.string().min(1).max(4),
  role: z.enum(WELL_ROLES),
  compound: z.string().min(1).max(64).optional(),
  concentrationUm: z.number().finite().nonnegative().optional(),
  substrateUm: z.number().finite().nonnegative().optional(),
  group: z.string().min(1).max(64).optional(),
});

/** JSON form: the format and the wells that are not empty (the rest are filled in as empty). */
export const plateMapJsonSchema = z.object({
  format: z.union([z.literal(96), z.literal(384), z.literal(1536)]),
  wells: z.array(plateMapWellSchema).max(1536),
});

/** Parse the JSON form into a full plate map, or issues (bad or duplicate wells, then validation). */
export function plateMapFromJson(input: unknown): PlateMapParseResult {
  const parsed = plateMapJsonSchema.safeParse(input);
  if (!parsed.success) {
    return {
      ok: false,
      issues: parsed.error.issues.slice(0, MAX_ISSUES).map((i) => issue({}, `${i.path.join(".")}: ${i.message}`)),
    };
  }
  const { format, wells: listed } = parsed.data;
  const issues: PlateIssue[] = [];
  const seen = new Set<number>();
  const wells: PlateMapWell[] = [...emptyPlateMap(format).wells];
  for (const w of listed) {
    const idx = indexOfWell(w.well, format);
    if (idx === undefined) {
      issues.push(issue({}, `${quoteCell(w.well)} is not a well of a ${format}-well plate`));
      continue;
    }
    const name = wellNameOfIdx(idx, format);
    if (seen.has(idx)) {
      issues.push(issue({ well: name }, "well is listed twice"));
      continue;
    }
    seen.add(idx);
    wells[idx] = { ...w, well: name };
  }
  if (issues.length > 0) return { ok: false, issues };
  const map: PlateMap = { format, wells };
  const v = validatePlateMap(map);
  return v.length > 0 ? { ok: false, issues: v } : { ok: true, map };
}
