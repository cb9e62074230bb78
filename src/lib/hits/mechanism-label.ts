/**
 * What a mechanism call's label means for a person reading a list of compounds (the hit grid, the
 * compound panel, the weekly digest): "inadequate" and "ambiguous" are shown as labels of their own
 * with one sentence saying why, built from the result's flags (the codes of
 * src/lib/kinetics/mechanism-judgement.ts and src/lib/analysis/compute.ts). Ranking does not read
 * this: flagged and ambiguous rows are ranked apart by the hit rows' `flagged` column.
 */

/** Why a call is inadequate, per flag, in the order they are told. */
const INADEQUATE_BECAUSE: readonly [flag: string, text: string][] = [
  ["inadequate-fit", "the chosen standard model fails its adequacy checks (lack of fit or residual pattern, p < 0.01)"],
  ["no-adequate-model", "no model tried describes the data adequately, so no Ki can be trusted"],
  ["substrate-inhibition", "the enzyme is substrate-inhibited: a model with substrate inhibition is recommended"],
  [
    "partial-inhibition",
    "partial inhibition: a model in which the enzyme–inhibitor–substrate complex turns over is recommended",
  ],
  ["tight-binding", "tight binding: inhibitor depletion makes the standard Ki and mechanism unreliable"],
];

export type MechanismLabelNote = { label: "inadequate" | "ambiguous"; why: string };

/**
 * The label to show beside a mechanism and why, or null for a clear call, a person's override or
 * no call. The sentence ends with what to do, since an inadequate call's Ki must not be used as is.
 */
export function mechanismLabelNote(label: string | null, flags: readonly string[]): MechanismLabelNote | null {
  if (label === "inadequate") {
    const reasons = INADEQUATE_BECAUSE.filter(([f]) => flags.includes(f)).map(([, t]) => t);
    const because = reasons.length ? reasons.join("; ") : "a model other than the standard call is recommended";
    return {
      label,
      why: `Mechanism inadequate: ${because}. Open the mechanism result before using this Ki.`,
    };
  }
  if (label === "ambiguous")
    return {
      label,
      why: "Mechanism ambiguous: another model lies within ΔAICc 2, or the call depends on the weighting or on proposed outliers.",
    };
  return null;
}
