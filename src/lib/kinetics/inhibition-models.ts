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

/**
 * Apparent inhibition constant at substrate S (the Cheng–Prusoff IC50 without depletion):
 * K′ = (S + Km)/(S/Kiu + Km/Kic), i.e. 1/K′ = (a·Km + b·S)/(Km + S) with a = 1/Kic, b = 1/Kiu
 * (Cheng & Prusoff, Biochem Pharmacol 1973;22:3099). Returns Infinity when a = b = 0.
 * Example: S = 10, Km = 5, Kic = 1, Kiu = 4 → 2.0.
 */
export function apparentKi(s: number, km: number, a: number, b: number): number {
  const q = (a * km + b * s) / (km + s);
  return q > 0 ? 1 / q : Infinity;
}

/**
 * Substrate inhibition (a second substrate molecule binds ES to give a dead-end SES, dissociation
 * constant Ksi) with the inhibition terms of the mixed model; independent complexes, rapid
 * equilibrium: v = Vmax·S / (Km(1 + I/Kic) + S(1 + I/Kiu) + S²/Ksi), d = 1/Ksi ≥ 0.
 * Haldane's form at I = 0 (Segel, Enzyme Kinetics 1975, ch. 3; Cornish-Bowden [from memory]).
 * Example: Vmax 10, Km 5, d = 0.01 (Ksi 100), no inhibitor, S = 10 → 100/16 = 6.25.
 */
export function substrateInhibitedRate(
  s: number,
  i: number,
  vmax: number,
  km: number,
  a: number,
  b: number,
  d: number,
): number {
  if (s === 0) return 0;
  return (vmax * s) / (km * (1 + a * i) + s * (1 + b * i) + d * s * s);
}

/**
 * Partial (hyperbolic) mixed inhibition: the ESI complex still turns over at β·kcat, so that
 * v = Vmax·S·(1 + β·I/Kiu) / (Km(1 + I/Kic) + S(1 + I/Kiu)), written with c = β·b = β/Kiu:
 * v = V·S·(1 + c·I) / (Km(1 + a·I) + S(1 + b·I)). β = 0 is the full mixed model; at saturating
 * inhibitor the rate levels off at v∞/v0 = c(Km + S)/(a·Km + b·S) of the uninhibited rate (β when
 * Kic = Kiu). Segel 1975, ch. 4; Copeland 2005 [from memory].
 * Example: Vmax 10, Km 5, a = b = 1, c = 0.4 (β 0.4), S = 5, I = 1000 → 2.0030 (≈ β·v0 = 2).
 */
export function partialInhibitedRate(
  s: number,
  i: number,
  vmax: number,
  km: number,
  a: number,
  b: number,
  c: number,
): number {
  if (s === 0) return 0;
  return (vmax * s * (1 + c * i)) / (km * (1 + a * i) + s * (1 + b * i));
}

/**
 * Tight binding in a substrate × inhibitor matrix: the Morrison quadratic at each S with K′ the
 * model's apparent constant (see apparentKi), E and I total concentrations:
 * v = Vmax·S/(Km + S) · (1 − ((E + I + K′) − √((E + I + K′)² − 4·E·I)) / (2E))
 * (Morrison, Biochim Biophys Acta 1969;185:269 [from memory]; K′ per mechanism as in Copeland,
 * Evaluation of Enzyme Inhibitors in Drug Discovery, 2005 [from memory]). Evaluated with
 * q = 1/K′ as 1 − 2·I·q / (u + √(u² − 4q²·E·I)), u = 1 + q(E + I), which is finite at q = 0 and
 * tends to the rapid-equilibrium model as E → 0.
 * Example: competitive, Vmax 1, Km 1, S = 1, Kic 0.5 (K′ = 1), E = 10: at I = 5 → 0.5·0.574166.
 */
export function tightBindingRate(
  s: number,
  i: number,
  e: number,
  vmax: number,
  km: number,
  a: number,
  b: number,
): number {
  if (s === 0) return 0;
  return ((vmax * s) / (km + s)) * morrisonFraction(i, e, (a * km + b * s) / (km + s));
}

/** 1 − 2·I·q / (u + √(u² − 4q²EI)), u = 1 + q(E + I): the Morrison free-enzyme fraction, q = 1/K′. */
export function morrisonFraction(i: number, e: number, q: number): number {
  const u = 1 + q * (e + i);
  const root = Math.sqrt(Math.max(0, u * u - 4 * q * q * e * i));
  return 1 - (2 * i * q) / (u + root);
}
