/**
 * α = Kiu/Kic as the grid and the panel show it. The four models are the mixed model's limits:
 * α = 1 noncompetitive, α → 0 uncompetitive (Kic → ∞), α → ∞ competitive (Kiu → ∞)
 * (Copeland, Evaluation of Enzyme Inhibitors in Drug Discovery, 2005; from memory). The fit
 * stores no number for "→ ∞", so a competitive call shows "∞" rather than a blank, and a mixed
 * fit with no Kiu (its uncompetitive part at zero) does too.
 */
export function formatAlpha(alpha: number | null, mechanism: string | null): string {
  if (alpha !== null) return String(Number(alpha.toPrecision(3)));
  return mechanism === "competitive" || mechanism === "mixed" ? "∞" : "—";
}
