/**
 * Mechanism-study planner: from a hit's IC50 and the target's Km, a substrate × inhibitor matrix
 * that separates the four mechanisms, and its plate map.
 *
 * Following the NIH Assay Guidance Manual (Markossian et al., eds., "Mechanism of Action Assays
 * for Enzymes"; second-hand) and common practice: substrate at 8 concentrations spanning about
 * 0.2–10 × Km (log-spaced, so that an uncompetitive component shows at high [S]); inhibitor 0
 * and about 0.3–10 × the expected Ki; replicates in adjacent rows; neutral and full-inhibition
 * controls on the plate. The expected Ki is the competitive Cheng–Prusoff estimate
 * Ki ≈ IC50 / (1 + S/Km), which is the lowest of the mechanisms' estimates, so 0.3–10 × it also
 * covers the others.
 */
import { mechanismMatrix, plateDimensions, rowLabel, type PlateFormat, type PlateMapWell } from "@/lib/plates";

export type PlanInput = {
  compound: string;
  ic50Um: number;
  kmUm: number;
  /** [S] at which the IC50 was measured, µM (default Km). */
  assaySubstrateUm?: number;
  /** Enzyme concentration, µM, if known: a tight-binding warning below 10·[E]. */
  enzymeUm?: number | null;
  format?: PlateFormat;
  replicates?: number;
};

export type Plan = {
  expectedKiUm: number;
  substrateUm: number[];
  inhibitorUm: number[];
  replicates: number;
  format: PlateFormat;
  wells: PlateMapWell[];
  warnings: string[];
};

const sig = (x: number) => Number(x.toPrecision(3));

export function planMechanismStudy(p: PlanInput): Plan {
  if (!(p.ic50Um > 0) || !(p.kmUm > 0)) throw new RangeError("The planner needs a positive IC50 and Km.");
  const s0 = p.assaySubstrateUm ?? p.kmUm;
  const format = p.format ?? 384;
  const replicates = p.replicates ?? 2;
  const expectedKiUm = p.ic50Um / (1 + s0 / p.kmUm);
  const substrateFactors = [0.2, 0.4, 0.8, 1.5, 2.5, 4, 6.5, 10];
  const substrateUm = substrateFactors.map((f) => sig(f * p.kmUm));
  const dims = plateDimensions(format);
  const levels = Math.min(6, Math.floor(dims.rows / replicates));
  if (levels < 3)
    throw new RangeError(
      `A ${format}-well plate has too few rows for ${replicates} replicates of at least 3 inhibitor concentrations.`,
    );
  // 0 and log-spaced multiples of the expected Ki from 0.3 to 10.
  const multiples =
    levels >= 6 ? [0.3, 1, 2, 4, 10] : levels === 5 ? [0.3, 1, 3, 10] : levels === 4 ? [0.3, 1.5, 6] : [1, 5];
  const inhibitorUm = [0, ...multiples.map((m) => sig(m * expectedKiUm))];
  const warnings: string[] = [];
  if (p.enzymeUm && p.ic50Um < 10 * p.enzymeUm) {
    warnings.push(
      `IC50 is within 10 × the enzyme concentration: tight binding is likely, so fit the Morrison equation and lower [E] if possible.`,
    );
  }
  if (dims.columns < substrateUm.length + 2)
    throw new RangeError(
      `A ${format}-well plate is too narrow for 8 substrate concentrations and two control columns.`,
    );
  const matrix = mechanismMatrix({ format, compound: p.compound, substrateUm, inhibitorUm, replicates, origin: "A3" });
  // Controls: neutral (no inhibitor, [S] = Km) in column 1, full inhibition (no enzyme) in column 2.
  const controlRows = Math.min(dims.rows, Math.max(4, inhibitorUm.length * replicates));
  const controls: PlateMapWell[] = [];
  for (let r = 0; r < controlRows; r++) {
    controls.push({ well: `${rowLabel(r)}1`, role: "neutral", substrateUm: sig(p.kmUm) });
    controls.push({ well: `${rowLabel(r)}2`, role: "full", substrateUm: sig(p.kmUm) });
  }
  return {
    expectedKiUm: sig(expectedKiUm),
    substrateUm,
    inhibitorUm,
    replicates,
    format,
    wells: [...controls, ...matrix],
    warnings,
  };
}
