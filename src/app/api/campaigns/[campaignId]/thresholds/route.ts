import { requireCampaign, requireUser } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { updateThresholds, type Thresholds } from "@/server/services/campaigns";
import { PatchThresholdsBody, ThresholdsResponse } from "./schema";
import type { z } from "zod";

export const dynamic = "force-dynamic";

const units = { qcMinZPrime: "dimensionless", qcMaxCvPct: "%", hitThresholdPct: "% inhibition" } as const;
const answer = (t: Thresholds): z.infer<typeof ThresholdsResponse> => ({
  qcMinZPrime: t.qcMinZPrime,
  qcMaxCvPct: t.qcMaxCvPct,
  hitThresholdPct: t.hitThresholdPct,
  units,
});

/** The campaign's QC and hit thresholds (members). */
export const GET = route<{ campaignId: string }>(async (_req, { campaignId }) => {
  const { campaign } = await requireCampaign(campaignId);
  return json(answer(campaign));
});

/**
 * Changes the QC and hit thresholds (project lead or admin; audited with the values before), as
 * the team page's settings form does. Fields left out keep their value.
 */
export const PATCH = route<{ campaignId: string }>(async (req, { campaignId }) => {
  await requireUser();
  const body = await parseJson(req, PatchThresholdsBody);
  const { user, campaign } = await requireCampaign(campaignId, "campaign:settings");
  const t: Thresholds = {
    qcMinZPrime: body.qcMinZPrime ?? campaign.qcMinZPrime,
    qcMaxCvPct: body.qcMaxCvPct ?? campaign.qcMaxCvPct,
    hitThresholdPct: body.hitThresholdPct ?? campaign.hitThresholdPct,
  };
  await updateThresholds(user, campaign, t);
  return json(answer(t));
});
