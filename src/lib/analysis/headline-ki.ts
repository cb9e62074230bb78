/**
 * The headline Ki of a mechanism: which inhibition constant stands for the whole call.
 *
 * - competitive: Kic (binding to free enzyme only; Kiu → ∞)
 * - uncompetitive: Kiu (binding to the enzyme–substrate complex only; Kic → ∞)
 * - noncompetitive: Kic (= Kiu = Ki by definition of the model)
 * - mixed: Kic (the free-enzyme constant, with α = Kiu/Kic reported beside it)
 *
 * Segel, Enzyme Kinetics (1975), ch. 3; Cornish-Bowden, Fundamentals of Enzyme Kinetics,
 * ch. 5 [from memory]. Reporting Kic for a mixed inhibitor is common practice.
 *
 * This record is the one owner of the choice: the analysis summary, the hit grid's refresh SQL
 * (through `headlineKeySql` in the hits service) and the result page all read it.
 */
import type { InhibitionModel } from "@/lib/kinetics";

export type HeadlineConstant = "kic" | "kiu";

export const HEADLINE_CONSTANT: Readonly<Record<InhibitionModel, HeadlineConstant>> = {
  competitive: "kic",
  uncompetitive: "kiu",
  noncompetitive: "kic",
  mixed: "kic",
};

type Interval = readonly [number | null, number | null];

/** A model's fit as stored in a result's detail (`detail.models[model]`): constants in µM. */
export type HeadlineFit = {
  kicUm: number | null;
  kiuUm: number | null;
  ci95?: Partial<Record<HeadlineConstant, Interval | null | undefined>> | null;
};

/**
 * The headline Ki of `model` and its 95 % CI from that model's fit.
 *
 * @example headlineKi("uncompetitive", { kicUm: null, kiuUm: 1.5, ci95: { kiu: [1.1, 2] } })
 *          // → { kiUm: 1.5, ci95: [1.1, 2] }
 */
export function headlineKi(
  model: InhibitionModel,
  fit: HeadlineFit,
): { kiUm: number | null; ci95: [number | null, number | null] } {
  const key = HEADLINE_CONSTANT[model];
  const ci = fit.ci95?.[key] ?? [null, null];
  return { kiUm: key === "kiu" ? fit.kiuUm : fit.kicUm, ci95: [ci[0] ?? null, ci[1] ?? null] };
}
