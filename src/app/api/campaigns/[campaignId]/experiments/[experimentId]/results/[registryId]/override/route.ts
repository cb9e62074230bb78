import type { z } from "zod";
import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { overrideMechanism } from "@/server/services/analyses";
import { PostOverrideBody, type PostOverrideResponse } from "./schema";

export const dynamic = "force-dynamic";

type Params = { campaignId: string; experimentId: string; registryId: string };

/**
 * Override the mechanism call of one compound in a mechanism study (assay scientists, leads and
 * admins; audited; the hit row is refreshed). 400 for another kind of experiment; 404 when the
 * current analysis has no result for the compound.
 */
export const POST = route<Params>(async (req, { campaignId, experimentId, registryId }) => {
  const { user } = await requireCampaign(campaignId, "analysis:override");
  const body = await parseJson(req, PostOverrideBody);
  await overrideMechanism(user, campaignId, experimentId, registryId, body.model, body.reason);
  const out: z.infer<typeof PostOverrideResponse> = { registryId, model: body.model, reason: body.reason };
  return json(out, 201);
});
