import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { previewDigest, sendCampaignDigest } from "@/server/services/digest";
import { AppError } from "@/server/errors";
import { postBody } from "./schema";

export const dynamic = "force-dynamic";

/**
 * The weekly digest of a campaign (lead or admin). `{"preview": true}` returns the rendered
 * e-mail without sending; otherwise this week's digest is sent now to every member who has not
 * had it (never twice per week).
 */
export const POST = route<{ campaignId: string }>(async (req, { campaignId }) => {
  const { user } = await requireCampaign(campaignId, "digest:send");
  const text = await req.text();
  let raw: unknown = {};
  try {
    raw = text ? JSON.parse(text) : {};
  } catch {
    throw new AppError("bad_request", "The request body must be JSON.");
  }
  const body = postBody.parse(raw);
  if (body.preview) {
    const p = await previewDigest(campaignId, { id: user.id, name: user.name });
    return json({ subject: p.subject, html: p.html, text: p.text });
  }
  const summary = await sendCampaignDigest(campaignId, { trigger: "send-now", actor: user });
  return json(summary);
});
