import type { z } from "zod";
import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { decideRun, runHead } from "@/server/services/plates";
import { PostDecisionBody, type PostDecisionResponse } from "./schema";

export const dynamic = "force-dynamic";

/**
 * Accept or reject a plate run (assay scientists and admins; audited). A run that fails QC cannot
 * be accepted (409 with the reason, as on the page): mask the wells at fault, or reject it. A
 * passing run accepted without a reason gets one that says so.
 */
export const POST = route<{ campaignId: string; runId: string }>(async (req, { campaignId, runId }) => {
  const { user } = await requireCampaign(campaignId, "plate:write");
  const body = await parseJson(req, PostDecisionBody);
  const decision = body.decision === "accept" ? "accepted" : "rejected";
  await decideRun(user, campaignId, runId, decision, body.reason ?? "Accepted through the API: QC passes.");
  const run = await runHead(campaignId, runId);
  const out: z.infer<typeof PostDecisionResponse> = {
    runId,
    decision,
    reason: run.reason ?? "",
    verdict: run.verdict,
    zPrime: run.zPrime,
  };
  return json(out);
});
