import type { z } from "zod";
import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { changeMasks, checkWellNames, runHead } from "@/server/services/plates";
import { PostMasksBody, type MasksResponse } from "./schema";

export const dynamic = "force-dynamic";

/**
 * Mask wells of a run with one reason (assay scientists and admins): the same service as the
 * page, so all or nothing in one transaction, one audit row per well, QC and % inhibition
 * recomputed. 400 for a name that is not a well of the run's plate; 409 for a well already masked.
 */
export const POST = route<{ campaignId: string; runId: string }>(async (req, { campaignId, runId }) => {
  const { user } = await requireCampaign(campaignId, "plate:write");
  const body = await parseJson(req, PostMasksBody);
  const wells = checkWellNames(body.wells, (await runHead(campaignId, runId)).format);
  const qcs = await changeMasks(
    user,
    campaignId,
    wells.map((well) => ({ runId, well, masked: true, reason: body.reason })),
  );
  const qc = qcs.get(runId)!;
  const out: z.infer<typeof MasksResponse> = {
    runId,
    wells,
    masked: true,
    qc: { zPrime: qc.zPrime, verdict: qc.verdict, reasons: qc.reasons },
  };
  return json(out);
});
