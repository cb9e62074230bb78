/**
 * Steady-state (rapid-equilibrium) reversible inhibition models for one substrate.
 *
 *   mixed:          v = Vmax·S / (Km(1 + I/Kic) + S(1 + I/Kiu)),   α = Kiu/Kic
 *   competitive:    1/Kiu = 0  → v = Vmax·S / (Km(1 + I/Kic) + S)
 *   uncompetitive:  1/Kic = 0  → v = Vmax·S / (Km + S(1 + I/Kiu))
 *   noncompetitive: Kic = Kiu = Ki → v = Vmax·S / ((Km + S)(1 + I/Ki))
 *
 * Apparent constants: Vmax,app = Vmax/(1 + I/Kiu), Km,app = Km(1 + I/Kic)/(1 + I/Kiu).
 * Segel, Enzyme Kinetics (1975), ch. 3; Cornish-Bowden, Fundamentals of Enzyme Kinetics,
 * ch. 5 [from memory]. Fits use a = 1/Kic and b = 1/Kiu so the competitive (b = 0) and
 * uncompetitive (a = 0) boundaries of the mixed model are reachable.
 */

export const INHIBITION_MODELS = ["competitive", "uncompetitive", "noncompetitive", "mixed"] as const;
export type InhibitionModel = (typeof INHIBITION_MODELS)[number];

/** Number of fitted parameters of each model (Vmax, Km and the inhibition constants). */
export const MODEL_PARAMETER_COUNT: Record<InhibitionModel, number> = {
  competitive: 3,
  uncompetitive: 3,
  noncompetitive: 3,
  mixed: 4,
};

/** v = V·S / (Km(1 + a·I) + S(1 + b·I)), a = 1/Kic, b = 1/Kiu (either may be 0). */
export function mixedRateReciprocal(s: number, i: number, vmax: number, km: number, a: number, b: number): number {
  if (s === 0) return 0;
  return (vmax * s) / (km * (1 + a * i) + s * (1 + b * i));
}

export interface InhibitionConstants {
  vmax: number;
  km: number;
  /** Kic; null or Infinity means no binding to free enzyme. */
  kic?: number | null;
  /** Kiu; null or Infinity means no binding to the enzyme–substrate complex. */
  kiu?: number | null;
}

function reciprocal(k: number | null | undefined): number {
  return k === null || k === undefined || k === Infinity ? 0 : 1 / k;
}

/**
 * Rate of `model` at substrate S and inhibitor I. For "noncompetitive" Ki is taken from `kic`
 * (or `kiu` when kic is absent); "competitive" ignores kiu and "uncompetitive" ignores kic.
 */
export function inhibitedRate(model: InhibitionModel, s: number, i: number, c: InhibitionConstants): number {
  let a = reciprocal(c.kic);
  let b = reciprocal(c.kiu);
  if (model === "competitive") b = 0;
  else if (model === "uncompetitive") a = 0;
  else if (model === "noncompetitive") {
    const k = c.kic ?? c.kiu;
    a = b = reciprocal(k);
  }
  return mixedRateReciprocal(s, i, c.vmax, c.km, a, b);
}

/** Apparent Vmax at inhibitor I: Vmax/(1 + I/Kiu). */
export function apparentVmax(i: number, c: InhibitionConstants): number {
  return c.vmax / (1 + i * reciprocal(c.kiu));
}

/** Apparent Km at inhibitor I: Km(1 + I/Kic)/(1 + I/Kiu). */
export function apparentKm(i: number, c: InhibitionConstants): number {
  return (c.km * (1 + i * reciprocal(c.kic))) / (1 + i * reciprocal(c.kiu));
}
