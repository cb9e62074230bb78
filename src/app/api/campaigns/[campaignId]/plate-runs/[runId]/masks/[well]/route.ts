import type { z } from "zod";
import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { checkWellNames, runHead, unmaskWell } from "@/server/services/plates";
import { DeleteMaskBody, type DeleteMaskResponse } from "./schema";

export const dynamic = "force-dynamic";

/**
 * Unmask one well with a reason (assay scientists and admins; audited): the mask row is closed,
 * not deleted, and QC is recomputed. 400 for a name that is not a well of the run's plate; 409
 * when the well is not masked.
 */
export const DELETE = route<{ campaignId: string; runId: string; well: string }>(async (req, params) => {
  const { user } = await requireCampaign(params.campaignId, "plate:write");
  const body = await parseJson(req, DeleteMaskBody);
  const [well] = checkWellNames([params.well], (await runHead(params.campaignId, params.runId)).format);
  const qc = await unmaskWell(user, params.campaignId, params.runId, well!, body.reason);
  const out: z.infer<typeof DeleteMaskResponse> = {
    runId: params.runId,
    wells: [well!],
    masked: false,
    qc: { zPrime: qc.zPrime, verdict: qc.verdict, reasons: qc.reasons },
  };
  return json(out);
});
