import type { z } from "zod";
import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { planFromResult } from "@/server/services/analyses";
import { PostPlanBody, type PostPlanResponse } from "./schema";

export const dynamic = "force-dynamic";

type Params = { campaignId: string; experimentId: string; registryId: string };

/**
 * Plan a mechanism study for a compound's result and save it as a new plate map (assay
 * scientists and admins; audited as a plate map creation): 201 with the map's id and layout.
 */
export const POST = route<Params>(async (req, { campaignId, experimentId, registryId }) => {
  const { user, campaign } = await requireCampaign(campaignId, "plate:write");
  const body = await parseJson(req, PostPlanBody);
  const { id, plan, ic50Um } = await planFromResult(user, campaign, experimentId, registryId, body);
  const out: z.infer<typeof PostPlanResponse> = {
    id,
    format: plan.format,
    ic50Um,
    expectedKiUm: plan.expectedKiUm,
    substrateUm: plan.substrateUm,
    inhibitorUm: plan.inhibitorUm,
    replicates: plan.replicates,
    warnings: plan.warnings,
    wells: plan.wells,
  };
  return json(out, 201);
});
