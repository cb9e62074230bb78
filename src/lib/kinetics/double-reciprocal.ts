/**
 * Double-reciprocal (Lineweaver–Burk) transform, for display only: parameters are always fitted
 * by nonlinear least squares on the untransformed rates, because the transform distorts the error
 * structure (an unweighted double-reciprocal fit of Puromycin gives Vm 195.8, K 0.0484 instead of
 * 212.7, 0.0641 — computed with SciPy).
 *
 *   1/v = (Km/Vmax)(1 + I/Kic)·(1/S) + (1/Vmax)(1 + I/Kiu)
 *
 * Lineweaver & Burk, J Am Chem Soc 1934;56:658. Competitive lines meet on the y-axis,
 * uncompetitive lines are parallel, noncompetitive lines meet on the x-axis at −1/Km, mixed lines
 * meet at 1/S = −1/(α·Km) (common practice).
 */
import type { MechanismPoint } from "./mechanism-fit";

export interface ReciprocalPoint {
  inverseSubstrate: number;
  inverseRate: number;
  inhibitor: number;
}

/** Transforms data points; rows with S ≤ 0 or v ≤ 0 have no reciprocal and are skipped. */
export function doubleReciprocalPoints(points: readonly MechanismPoint[]): {
  points: ReciprocalPoint[];
  skipped: number;
} {
  const out: ReciprocalPoint[] = [];
  let skipped = 0;
  for (const p of points) {
    if (p.substrate > 0 && p.rate > 0)
      out.push({ inverseSubstrate: 1 / p.substrate, inverseRate: 1 / p.rate, inhibitor: p.inhibitor });
    else skipped++;
  }
  return { points: out, skipped };
}

export interface ReciprocalLine {
  inhibitor: number;
  /** Km,app/Vmax,app = (Km/Vmax)(1 + I/Kic) */
  slope: number;
  /** 1/Vmax,app = (1 + I/Kiu)/Vmax */
  intercept: number;
  /** −intercept/slope = −1/Km,app */
  xIntercept: number;
  /** Two end points for drawing, from x = xFrom to x = xTo. */
  ends: [[number, number], [number, number]];
}

/**
 * The straight line in double-reciprocal coordinates of the fitted model at each inhibitor
 * concentration. `kic`/`kiu` null means infinite (no such binding).
 */
export function doubleReciprocalLines(
  fit: { vmax: number; km: number; kic: number | null; kiu: number | null },
  inhibitors: readonly number[],
  xFrom: number,
  xTo: number,
): ReciprocalLine[] {
  const a = fit.kic === null ? 0 : 1 / fit.kic;
  const b = fit.kiu === null ? 0 : 1 / fit.kiu;
  return inhibitors.map((i) => {
    const slope = (fit.km / fit.vmax) * (1 + a * i);
    const intercept = (1 + b * i) / fit.vmax;
    return {
      inhibitor: i,
      slope,
      intercept,
      xIntercept: -intercept / slope,
      ends: [
        [xFrom, intercept + slope * xFrom],
        [xTo, intercept + slope * xTo],
      ],
    };
  });
}
