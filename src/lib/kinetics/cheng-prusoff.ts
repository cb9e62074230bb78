/**
 * IC50 ↔ Ki conversions (Cheng & Prusoff, Biochem Pharmacol 1973;22:3099–3108).
 *
 * General (mixed) form: IC50 = (S + Km) / (S/Kiu + Km/Kic).
 *   competitive:    IC50 = Kic·(1 + S/Km)
 *   uncompetitive:  IC50 = Kiu·(1 + Km/S)
 *   noncompetitive: IC50 = Ki
 * Valid for rapid-equilibrium inhibition without inhibitor depletion and with a Hill slope of 1
 * (exact correction for other cases: Munson & Rodbard, J Recept Res 1988;8:533). For tight
 * binding (IC50 within ~10× the enzyme concentration) use morrison.ts instead.
 */
import type { InhibitionModel } from "./inhibition-models";

function checkPositive(name: string, v: number, allowZero = false): void {
  if (!Number.isFinite(v) || v < 0 || (!allowZero && v === 0)) {
    throw new RangeError(`Cheng–Prusoff: ${name} must be a finite number ${allowZero ? "≥" : ">"} 0 (got ${v})`);
  }
}

export interface ChengPrusoffInput {
  /** Substrate concentration in the assay. */
  s: number;
  /** Michaelis constant, same unit as s. */
  km: number;
  /** Kic (competitive part); Infinity or null for none. */
  kic?: number | null;
  /** Kiu (uncompetitive part); Infinity or null for none. */
  kiu?: number | null;
}

/**
 * IC50 = (S + Km)/(S/Kiu + Km/Kic) for the given mechanism. For "noncompetitive" Ki is `kic`
 * (or `kiu` when kic is absent). Example: S = 10, Km = 5, mixed Kic 1, Kiu 4 → IC50 = 2.0.
 */
export function ic50FromKi(model: InhibitionModel, input: ChengPrusoffInput): number {
  const { s, km } = input;
  checkPositive("S", s, true);
  checkPositive("Km", km);
  const inv = (k: number | null | undefined): number => (k === null || k === undefined || k === Infinity ? 0 : 1 / k);
  let a = inv(input.kic);
  let b = inv(input.kiu);
  if (model === "competitive") b = 0;
  else if (model === "uncompetitive") a = 0;
  else if (model === "noncompetitive") a = b = inv(input.kic ?? input.kiu);
  if (input.kic !== undefined && input.kic !== null) checkPositive("Kic", input.kic);
  if (input.kiu !== undefined && input.kiu !== null) checkPositive("Kiu", input.kiu);
  const denominator = s * b + km * a;
  return denominator > 0 ? (s + km) / denominator : Infinity;
}

export interface KiFromIc50Input {
  ic50: number;
  s: number;
  km: number;
  /** α = Kiu/Kic, needed for "mixed" only. */
  alpha?: number;
}

/**
 * Inverse Cheng–Prusoff: the inhibition constant from an IC50 measured at substrate S.
 *   competitive:    Kic = IC50/(1 + S/Km)
 *   uncompetitive:  Kiu = IC50/(1 + Km/S)
 *   noncompetitive: Ki = IC50
 *   mixed (given α): Kic = IC50·(S/α + Km)/(S + Km), Kiu = α·Kic
 * Returns { kic, kiu } with null where the mechanism has no such constant.
 */
export function kiFromIc50(model: InhibitionModel, input: KiFromIc50Input): { kic: number | null; kiu: number | null } {
  const { ic50, s, km } = input;
  checkPositive("IC50", ic50);
  checkPositive("S", s, true);
  checkPositive("Km", km);
  switch (model) {
    case "competitive":
      return { kic: ic50 / (1 + s / km), kiu: null };
    case "uncompetitive":
      if (s === 0) throw new RangeError("Cheng–Prusoff: an uncompetitive inhibitor has no finite IC50 at S = 0");
      return { kic: null, kiu: ic50 / (1 + km / s) };
    case "noncompetitive":
      return { kic: ic50, kiu: ic50 };
    case "mixed": {
      const alpha = input.alpha;
      if (alpha === undefined) throw new RangeError("Cheng–Prusoff: the mixed model needs alpha = Kiu/Kic");
      checkPositive("alpha", alpha);
      const kic = (ic50 * (s / alpha + km)) / (s + km);
      return { kic, kiu: alpha * kic };
    }
  }
}
