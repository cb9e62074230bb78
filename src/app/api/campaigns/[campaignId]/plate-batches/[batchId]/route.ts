import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { getBatch } from "@/server/services/plates/batches";

export const dynamic = "force-dynamic";

/** A plate batch: each file's outcome (stored with its run, duplicate with the earlier run, refused with why, unmatched) and the runs' QC (members). */
export const GET = route<{ campaignId: string; batchId: string }>(async (_req, { campaignId, batchId }) => {
  await requireCampaign(campaignId, "campaign:read");
  return json(await getBatch(campaignId, batchId));
});
