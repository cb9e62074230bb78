/**
 * Microplate geometry: formats, row labels, well names and positions.
 *
 * Layouts follow the ANSI/SLAS microplate standards 1-2004 to 4-2004 (from memory): 96 wells as
 * 8 rows × 12 columns, 384 as 16 × 24, 1536 as 32 × 48. Rows are lettered A–Z, then AA–AF for
 * rows 27–32 of a 1536-well plate; columns are numbered from 1.
 *
 * Canonical well name: row letters in upper case followed by the column number without zero
 * padding (`A1`, `P24`, `AF48`). Parsing accepts padding and lower case (`A01`, `a1`, `af048`).
 * Indices are row-major and zero-based: index = row × columns + column.
 */

export const PLATE_FORMATS = [96, 384, 1536] as const;
export type PlateFormat = (typeof PLATE_FORMATS)[number];

export interface PlateDimensions {
  readonly format: PlateFormat;
  readonly rows: number;
  readonly columns: number;
}

const DIMENSIONS: Record<PlateFormat, PlateDimensions> = {
  96: { format: 96, rows: 8, columns: 12 },
  384: { format: 384, rows: 16, columns: 24 },
  1536: { format: 1536, rows: 32, columns: 48 },
};

export function isPlateFormat(value: unknown): value is PlateFormat {
  return PLATE_FORMATS.some((f) => f === value);
}

export function plateDimensions(format: PlateFormat): PlateDimensions {
  return DIMENSIONS[format];
}

/** The format whose grid is exactly rows × columns, or undefined. */
export function formatForGrid(rows: number, columns: number): PlateFormat | undefined {
  for (const f of PLATE_FORMATS) {
    const d = DIMENSIONS[f];
    if (d.rows === rows && d.columns === columns) return f;
  }
  return undefined;
}

/** Row label for a zero-based row: 0 → A … 25 → Z, 26 → AA … 31 → AF. */
export function rowLabel(row: number): string {
  if (!Number.isInteger(row) || row < 0 || row >= 32) {
    throw new RangeError(`row ${row} is outside 0–31`);
  }
  return row < 26 ? String.fromCharCode(65 + row) : "A" + String.fromCharCode(65 + row - 26);
}

/** Zero-based row of a label (A → 0, AF → 31), case-insensitive; undefined if not a row label. */
export function rowIndexOfLabel(label: string): number | undefined {
  const s = label.trim().toUpperCase();
  if (/^[A-Z]$/.test(s)) return s.charCodeAt(0) - 65;
  if (/^A[A-F]$/.test(s)) return 26 + s.charCodeAt(1) - 65;
  return undefined;
}

export interface WellPosition {
  /** zero-based row */
  readonly row: number;
  /** zero-based column */
  readonly column: number;
}

const WELL_RE = /^\s*([A-Za-z]{1,2})\s*0*(\d{1,3})\s*$/;

/**
 * Parse a well name (`A1`, `A01`, `a1`, `AF48`) into a zero-based position, without checking it
 * against a plate format. Returns undefined for anything else.
 */
export function parseWellName(name: string): WellPosition | undefined {
  const m = WELL_RE.exec(name);
  if (!m) return undefined;
  const row = rowIndexOfLabel(m[1]!);
  const col = Number(m[2]);
  if (row === undefined || col < 1) return undefined;
  return { row, column: col - 1 };
}

/** True when the position lies on a plate of the given format. */
export function fitsFormat(pos: WellPosition, format: PlateFormat): boolean {
  const d = DIMENSIONS[format];
  return pos.row >= 0 && pos.row < d.rows && pos.column >= 0 && pos.column < d.columns;
}

/** Smallest standard format that holds the position (or undefined past 32 × 48). */
export function smallestFormatFor(pos: WellPosition): PlateFormat | undefined {
  return PLATE_FORMATS.find((f) => fitsFormat(pos, f));
}

/** Canonical name of a position: `A1`, `P24`, `AF48`. */
export function wellName(pos: WellPosition): string {
  return rowLabel(pos.row) + String(pos.column + 1);
}

/** Name with the column zero-padded to two digits (`A01`, `P24`, `AF48`), as many readers write it. */
export function paddedWellName(pos: WellPosition, format: PlateFormat): string {
  const width = String(DIMENSIONS[format].columns).length;
  return rowLabel(pos.row) + String(pos.column + 1).padStart(width, "0");
}

/**
 * Canonical form of any accepted well name (`p024` → `P24`); undefined if it is not a well name
 * or, when a format is given, lies off that plate.
 */
export function canonicalWell(name: string, format?: PlateFormat): string | undefined {
  const pos = parseWellName(name);
  if (!pos || (format !== undefined && !fitsFormat(pos, format))) return undefined;
  return wellName(pos);
}

export function wellIndex(pos: WellPosition, format: PlateFormat): number {
  return pos.row * DIMENSIONS[format].columns + pos.column;
}

export function positionOfIndex(index: number, format: PlateFormat): WellPosition {
  const d = DIMENSIONS[format];
  if (!Number.isInteger(index) || index < 0 || index >= d.format) {
    throw new RangeError(`well index ${index} is outside 0–${d.format - 1}`);
  }
  return { row: Math.floor(index / d.columns), column: index % d.columns };
}

/** Zero-based row-major index of a well name on a format, or undefined. */
export function indexOfWell(name: string, format: PlateFormat): number | undefined {
  const pos = parseWellName(name);
  if (!pos || !fitsFormat(pos, format)) return undefined;
  return wellIndex(pos, format);
}

export function wellNameOfIndex(index: number, format: PlateFormat): string {
  return wellName(positionOfIndex(index, format));
}

/** All canonical well names of a format in row-major order (A1, A2, … B1, …). */
export function allWells(format: PlateFormat): string[] {
  const out: string[] = new Array(format);
  for (let i = 0; i < format; i++) out[i] = wellNameOfIndex(i, format);
  return out;
}

/**
 * Outer ring of the plate (first and last row, first and last column). Edge effects from
 * evaporation and temperature gradients show up there first (common practice).
 */
export function isEdgeWell(pos: WellPosition, format: PlateFormat): boolean {
  const d = DIMENSIONS[format];
  return pos.row === 0 || pos.column === 0 || pos.row === d.rows - 1 || pos.column === d.columns - 1;
}

export function isEdgeWellName(name: string, format: PlateFormat): boolean {
  const pos = parseWellName(name);
  if (!pos || !fitsFormat(pos, format)) throw new RangeError(`"${name}" is not a well of a ${format}-well plate`);
  return isEdgeWell(pos, format);
}
