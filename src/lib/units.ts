/** Concentration unit conversions for values stored with their unit (campaign Km, [E]). */
const toUm: Record<string, number> = { pM: 1e-6, nM: 1e-3, µM: 1, uM: 1, mM: 1e3, M: 1e6 };

export function toMicromolar(value: number, unit: string): number {
  const f = toUm[unit];
  if (f === undefined) throw new RangeError(`unknown concentration unit "${unit}"`);
  return value * f;
}

export function toNanomolar(value: number, unit: string): number {
  return toMicromolar(value, unit) * 1000;
}

/** A concentration in µM written with a readable unit: 0.0042 µM → "4.2 nM". */
export function formatConcentration(um: number | null | undefined, digits = 3): string {
  if (um === null || um === undefined || !Number.isFinite(um)) return "—";
  const abs = Math.abs(um);
  if (abs === 0) return "0 µM";
  if (abs < 1e-3) return `${Number((um * 1e6).toPrecision(digits))} pM`;
  if (abs < 1) return `${Number((um * 1e3).toPrecision(digits))} nM`;
  if (abs < 1000) return `${Number(um.toPrecision(digits))} µM`;
  return `${Number((um / 1000).toPrecision(digits))} mM`;
}

/**
 * A confidence interval of concentrations in µM: "1.2 µM – 3.4 µM"; a missing upper bound is an
 * unbounded interval ("1.2 µM – ∞"); no bounds at all is "—".
 */
export function formatConcentrationRange(loUm: number | null | undefined, hiUm: number | null | undefined): string {
  if (loUm == null && hiUm == null) return "—";
  return `${formatConcentration(loUm)} – ${hiUm == null ? "∞" : formatConcentration(hiUm)}`;
}

/**
 * The campaign's Km in µM, from the value and unit it was entered with (null when not set). The
 * one place that reads a campaign's Km: analyses, the planner and the result pages call it.
 */
export function campaignKmUm(campaign: { kmValue: number | null; kmUnit: string | null }): number | null {
  return campaign.kmValue === null ? null : toMicromolar(campaign.kmValue, campaign.kmUnit ?? "µM");
}
