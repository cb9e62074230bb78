import "server-only";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import { planMechanismStudy, type Plan } from "@/lib/analysis/planner";
import { plateMapFromWells, type PlateFormat } from "@/lib/plates";
import { campaignKmUm } from "@/lib/units";
import { createPlateMap } from "../plates/plate-maps";
import type { Campaign } from "../campaigns";
import { getExperiment } from "./experiments";
import { compoundResultDetail } from "./results";

export type PlanRequest = {
  compoundId: string;
  ic50Um: number;
  /** Km of the substrate, µM; defaults to the campaign's. */
  kmUm?: number;
  /** [S] at which the IC50 was measured, µM (default Km). */
  assaySubstrateUm?: number;
  format: PlateFormat;
  name: string;
};

/**
 * Plan a mechanism study for a hit (substrate × inhibitor matrix from its IC50 and the Km; see
 * src/lib/analysis/planner.ts for the design and its source) and save it as a new plate map of
 * the campaign. 400 when no Km is known or the plate is too small for the matrix.
 */
export async function planMechanismPlate(
  actor: Actor,
  campaign: Campaign,
  req: PlanRequest,
): Promise<{ id: string; plan: Plan }> {
  const kmUm = req.kmUm ?? campaignKmUm(campaign);
  if (!kmUm)
    throw new AppError("bad_request", "Set the target's Km (in the campaign or here) to plan a mechanism study.");
  let plan: Plan;
  try {
    plan = planMechanismStudy({
      compound: req.compoundId,
      ic50Um: req.ic50Um,
      kmUm,
      assaySubstrateUm: req.assaySubstrateUm,
      format: req.format,
    });
  } catch (e) {
    if (e instanceof RangeError) throw new AppError("bad_request", e.message);
    throw e;
  }
  const { id } = await createPlateMap(actor, campaign.id, {
    name: req.name,
    map: plateMapFromWells(plan.format, plan.wells),
  });
  return { id, plan };
}

/**
 * The planner for a result of an experiment: the IC50 defaults to the compound's current result
 * (a dose-response fit) and the assay [S] to the experiment's substrate setting. 404 when the
 * experiment is not in the campaign, or no IC50 is given and the current analysis has none.
 */
export async function planFromResult(
  actor: Actor,
  campaign: Campaign,
  experimentId: string,
  registryId: string,
  req: Omit<PlanRequest, "compoundId" | "ic50Um"> & { ic50Um?: number },
): Promise<{ id: string; plan: Plan; ic50Um: number }> {
  const experiment = await getExperiment(campaign.id, experimentId);
  let ic50Um = req.ic50Um;
  if (ic50Um === undefined) {
    const result = await compoundResultDetail(experimentId, registryId);
    if (result.ic50Um === null || !(result.ic50Um > 0))
      throw new AppError(
        "bad_request",
        `The current result of ${registryId} has no IC50 to plan from: give ic50Um (µM) in the request.`,
      );
    ic50Um = result.ic50Um;
  }
  const assaySubstrateUm = req.assaySubstrateUm ?? experiment.settings.substrateUm ?? undefined;
  const out = await planMechanismPlate(actor, campaign, { ...req, compoundId: registryId, ic50Um, assaySubstrateUm });
  return { ...out, ic50Um };
}
