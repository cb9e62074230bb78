/**
 * Plate map layouts for the three experiment kinds, used by the fixtures and the demo campaign.
 * Controls sit in the outer two columns on each side (common practice, so that an edge effect
 * shows in both controls and samples): neutral in the first and second-to-last column,
 * full-inhibition in the second and last column.
 */
import { fillDilutionSeries, mechanismMatrix, placeWells, selectColumns, assignWells } from "./editor";
import { plateDimensions, type PlateFormat, wellName } from "./geometry";
import { emptyPlateMap, type PlateMap } from "./plate-map";

export interface ControlOptions {
  /** the reference inhibitor in full-inhibition wells, if any */
  readonly referenceCompound?: string;
  readonly referenceConcentrationUm?: number;
  /** substrate written on control wells (mechanism studies) */
  readonly substrateUm?: number;
}

export function withControls(format: PlateFormat, o: ControlOptions = {}): PlateMap {
  const n = plateDimensions(format).columns;
  let map = emptyPlateMap(format);
  const s = o.substrateUm !== undefined ? { substrateUm: o.substrateUm } : {};
  map = assignWells(map, selectColumns(format, [1, n - 1]), { role: "neutral", group: "neutral", ...s });
  map = assignWells(map, selectColumns(format, [2, n]), {
    role: "full",
    group: "full",
    ...s,
    ...(o.referenceCompound
      ? { compound: o.referenceCompound, concentrationUm: o.referenceConcentrationUm ?? 100 }
      : {}),
  });
  return map;
}

/** Columns between the controls: 3 … N−2 (1-based). */
export function sampleColumns(format: PlateFormat): number[] {
  const n = plateDimensions(format).columns;
  return Array.from({ length: n - 4 }, (_, i) => i + 3);
}

/** How many compounds a single-dose plate holds with the given replicates. */
export function singleDoseCapacity(format: PlateFormat, replicates: number): number {
  const d = plateDimensions(format);
  return Math.floor(sampleColumns(format).length / replicates) * d.rows;
}

/**
 * Single-dose screen: each compound at one concentration, replicates in adjacent columns,
 * filled row by row.
 */
export function singleDoseLayout(
  format: PlateFormat,
  compounds: readonly string[],
  concentrationUm: number,
  replicates: number,
  controls: ControlOptions = {},
): PlateMap {
  const cap = singleDoseCapacity(format, replicates);
  if (compounds.length > cap)
    throw new RangeError(
      `${compounds.length} compounds do not fit; a ${format}-well plate holds ${cap} with ${replicates} replicates`,
    );
  const cols = sampleColumns(format);
  const perRow = Math.floor(cols.length / replicates);
  const wells = compounds.flatMap((compound, k) => {
    const row = Math.floor(k / perRow);
    const slot = k % perRow;
    return Array.from({ length: replicates }, (_, rep) => ({
      well: wellName({ row, column: cols[slot * replicates + rep]! - 1 }),
      role: "sample" as const,
      compound,
      concentrationUm,
      group: compound,
    }));
  });
  return placeWells(withControls(format, controls), wells);
}

export interface SeriesSpec {
  readonly compound: string;
  readonly topConcentrationUm: number;
}

/** How many series of `points` fit per row, and compounds per plate with replicates in adjacent rows. */
export function doseResponseCapacity(format: PlateFormat, points: number, replicates: number): number {
  const perRow = Math.floor(sampleColumns(format).length / points);
  return perRow * Math.floor(plateDimensions(format).rows / replicates);
}

/**
 * Dose-response: each compound a serial dilution along a row from its top concentration,
 * replicates in adjacent rows; as many series per row as fit between the controls.
 */
export function doseResponseLayout(
  format: PlateFormat,
  series: readonly SeriesSpec[],
  o: { points: number; dilutionFactor: number; replicates: number },
  controls: ControlOptions = {},
): PlateMap {
  const cap = doseResponseCapacity(format, o.points, o.replicates);
  if (series.length > cap)
    throw new RangeError(`${series.length} series do not fit; a ${format}-well plate holds ${cap}`);
  const cols = sampleColumns(format);
  const perRow = Math.floor(cols.length / o.points);
  let map = withControls(format, controls);
  series.forEach((s, k) => {
    const rowBlock = Math.floor(k / perRow) * o.replicates;
    const firstCol = cols[(k % perRow) * o.points]!;
    const from = wellName({ row: rowBlock, column: firstCol - 1 });
    const to = wellName({ row: rowBlock + o.replicates - 1, column: firstCol - 1 + o.points - 1 });
    map = fillDilutionSeries(map, {
      from,
      to,
      along: "row",
      topConcentrationUm: s.topConcentrationUm,
      dilutionFactor: o.dilutionFactor,
      compound: s.compound,
    });
  });
  // Replicate groups: the same compound and concentration.
  return {
    format,
    wells: map.wells.map((w) =>
      w.role === "sample" && w.compound ? { ...w, group: `${w.compound}@${w.concentrationUm}` } : w,
    ),
  };
}

export interface MechanismBlock {
  readonly compound: string;
  readonly inhibitorUm: readonly number[];
}

/**
 * Mechanism study: one substrate × inhibitor block per compound (substrate across, inhibitor
 * with replicates down), blocks tiled left to right then top to bottom between the controls.
 */
export function mechanismLayout(
  format: PlateFormat,
  blocks: readonly MechanismBlock[],
  substrateUm: readonly number[],
  replicates: number,
  controls: ControlOptions = {},
): PlateMap {
  const d = plateDimensions(format);
  const cols = sampleColumns(format);
  const perRow = Math.floor(cols.length / substrateUm.length);
  let map = withControls(format, controls);
  let row = 0;
  blocks.forEach((b, k) => {
    const slot = k % perRow;
    if (k > 0 && slot === 0)
      row += Math.max(...blocks.slice(k - perRow, k).map((x) => x.inhibitorUm.length)) * replicates;
    const origin = wellName({ row, column: cols[slot * substrateUm.length]! - 1 });
    if (row + b.inhibitorUm.length * replicates > d.rows)
      throw new RangeError(`mechanism block for ${b.compound} does not fit a ${format}-well plate`);
    map = placeWells(
      map,
      mechanismMatrix({ format, compound: b.compound, substrateUm, inhibitorUm: b.inhibitorUm, replicates, origin }),
    );
  });
  return map;
}
