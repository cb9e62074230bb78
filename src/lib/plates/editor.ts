/**
 * Pure editing steps for the plate map editor. Each returns a new plate map (or a list of wells)
 * and leaves its input untouched, so the editor can keep an undo history by reference.
 */
import {
  fitsFormat,
  parseWellName,
  plateDimensions,
  type PlateFormat,
  wellIndex,
  wellName,
  type WellPosition,
} from "./geometry";
import { type PlateMap, type PlateMapWell, type WellRole } from "./plate-map";

function positionOn(name: string, format: PlateFormat): WellPosition {
  const pos = parseWellName(name);
  if (!pos || !fitsFormat(pos, format)) throw new RangeError(`"${name}" is not a well of a ${format}-well plate`);
  return pos;
}

/**
 * Wells of the rectangle spanned by two corner wells (either order), row-major, canonical names.
 * Example: selectBlock(96, "B2", "C3") → ["B2", "B3", "C2", "C3"].
 */
export function selectBlock(format: PlateFormat, corner1: string, corner2: string): string[] {
  const a = positionOn(corner1, format);
  const b = positionOn(corner2, format);
  const out: string[] = [];
  for (let r = Math.min(a.row, b.row); r <= Math.max(a.row, b.row); r++) {
    for (let c = Math.min(a.column, b.column); c <= Math.max(a.column, b.column); c++)
      out.push(wellName({ row: r, column: c }));
  }
  return out;
}

/** Every well of the given rows (`["A", "P"]`) or columns (`[1, 24]`). */
export function selectRows(format: PlateFormat, rows: readonly string[]): string[] {
  const d = plateDimensions(format);
  return rows.flatMap((r) => selectBlock(format, `${r}1`, `${r}${d.columns}`));
}
export function selectColumns(format: PlateFormat, columns: readonly number[]): string[] {
  const d = plateDimensions(format);
  const last = d.rows === 32 ? "AF" : String.fromCharCode(64 + d.rows);
  return columns.flatMap((c) => selectBlock(format, `A${c}`, `${last}${c}`));
}

/** What an assignment may set; `undefined` leaves a field as it is, `null` clears it. */
export interface WellPatch {
  readonly role?: WellRole;
  readonly compound?: string | null;
  readonly concentrationUm?: number | null;
  readonly substrateUm?: number | null;
  readonly group?: string | null;
}

function applyPatch(w: PlateMapWell, patch: WellPatch): PlateMapWell {
  if (patch.role === "empty") return { well: w.well, role: "empty" };
  const out: { -readonly [K in keyof PlateMapWell]: PlateMapWell[K] } = { ...w };
  if (patch.role !== undefined) out.role = patch.role;
  for (const key of ["compound", "concentrationUm", "substrateUm", "group"] as const) {
    const v = patch[key];
    if (v === null) delete out[key];
    else if (v !== undefined) (out as Record<string, unknown>)[key] = v;
  }
  return out;
}

/** Assign a role and/or contents to wells. Setting role `empty` clears the wells. */
export function assignWells(map: PlateMap, wells: readonly string[], patch: WellPatch): PlateMap {
  const next = [...map.wells];
  for (const name of wells) {
    const idx = wellIndex(positionOn(name, map.format), map.format);
    next[idx] = applyPatch(next[idx]!, patch);
  }
  return { format: map.format, wells: next };
}

/** Put a list of wells (e.g. from mechanismMatrix) onto a map, replacing what was there. */
export function placeWells(map: PlateMap, wells: readonly PlateMapWell[]): PlateMap {
  const next = [...map.wells];
  for (const w of wells) {
    const idx = wellIndex(positionOn(w.well, map.format), map.format);
    next[idx] = { ...w, well: next[idx]!.well };
  }
  return { format: map.format, wells: next };
}

/** Round to 12 significant digits so that 100/3/3 prints as 11.1111111111, not 11.111111111111112. */
export function roundConcentration(x: number): number {
  return x === 0 ? 0 : Number(x.toPrecision(12));
}

export interface DilutionSeriesOptions {
  /** corners of the block to fill */
  readonly from: string;
  readonly to: string;
  /** `row`: the series runs along each row (column by column); `column`: down each column */
  readonly along: "row" | "column";
  readonly topConcentrationUm: number;
  /** 2, 3 or 10 for 1:2, 1:3, 1:10 (any factor > 1 is accepted) */
  readonly dilutionFactor: number;
  /** the series starts at `from`'s end of the block (default) or runs the other way */
  readonly descendingFrom?: "from" | "to";
  readonly compound?: string;
  /** role for the filled wells; default `sample` */
  readonly role?: WellRole;
}

/**
 * Fill a serial dilution: the well at position k along the series gets top / factor^k
 * (common practice). Every row (or column) of the block gets the same series.
 */
export function fillDilutionSeries(map: PlateMap, o: DilutionSeriesOptions): PlateMap {
  if (!(o.dilutionFactor > 1) || !Number.isFinite(o.dilutionFactor))
    throw new RangeError("dilution factor must be a number above 1");
  if (!(o.topConcentrationUm > 0) || !Number.isFinite(o.topConcentrationUm))
    throw new RangeError("top concentration must be a positive number");
  const a = positionOn(o.from, map.format);
  const b = positionOn(o.to, map.format);
  const next = [...map.wells];
  const reverse = o.descendingFrom === "to";
  for (const name of selectBlock(map.format, o.from, o.to)) {
    const p = positionOn(name, map.format);
    const start = o.along === "row" ? (reverse ? b.column : a.column) : reverse ? b.row : a.row;
    const here = o.along === "row" ? p.column : p.row;
    const k = Math.abs(here - start);
    const idx = wellIndex(p, map.format);
    next[idx] = applyPatch(next[idx]!, {
      role: o.role ?? "sample",
      concentrationUm: roundConcentration(o.topConcentrationUm / o.dilutionFactor ** k),
      ...(o.compound !== undefined ? { compound: o.compound } : {}),
    });
  }
  return { format: map.format, wells: next };
}

export interface MechanismMatrixOptions {
  readonly format: PlateFormat;
  readonly compound: string;
  /** substrate concentrations, one per column */
  readonly substrateUm: readonly number[];
  /** inhibitor concentrations (include 0), one row per concentration and replicate */
  readonly inhibitorUm: readonly number[];
  readonly replicates: number;
  /** top-left well of the block; default A1 */
  readonly origin?: string;
}

/**
 * Sample wells for a mechanism study: columns are substrate concentrations, rows are inhibitor
 * concentrations with replicates in adjacent rows. Group names `S<s>_I<i>` mark replicates.
 * Throws when the block does not fit the plate.
 */
export function mechanismMatrix(o: MechanismMatrixOptions): PlateMapWell[] {
  if (!Number.isInteger(o.replicates) || o.replicates < 1)
    throw new RangeError("replicates must be a whole number ≥ 1");
  const origin = positionOn(o.origin ?? "A1", o.format);
  const d = plateDimensions(o.format);
  const rowsNeeded = o.inhibitorUm.length * o.replicates;
  if (origin.row + rowsNeeded > d.rows || origin.column + o.substrateUm.length > d.columns) {
    throw new RangeError(
      `a ${rowsNeeded} × ${o.substrateUm.length} matrix from ${wellName(origin)} does not fit a ${o.format}-well plate (${d.rows} × ${d.columns})`,
    );
  }
  const out: PlateMapWell[] = [];
  o.inhibitorUm.forEach((i, ii) => {
    for (let rep = 0; rep < o.replicates; rep++) {
      o.substrateUm.forEach((s, si) => {
        out.push({
          well: wellName({ row: origin.row + ii * o.replicates + rep, column: origin.column + si }),
          role: "sample",
          compound: o.compound,
          concentrationUm: i,
          substrateUm: s,
          group: `S${s}_I${i}`,
        });
      });
    }
  });
  return out;
}
