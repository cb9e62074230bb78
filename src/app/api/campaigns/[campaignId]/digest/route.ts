import { requireCampaign, requireUser } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { previewDigest, sendCampaignDigest, setSchedule } from "@/server/services/digest";
import { AppError } from "@/server/errors";
import { DigestScheduleResponse, PatchDigestBody, postBody } from "./schema";
import type { z } from "zod";

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

/**
 * Sets when the weekly digest goes out (lead or admin; audited): the ISO weekday, the local hour
 * and the campaign's time zone. Fields left out keep their value; answers the whole schedule.
 */
export const PATCH = route<{ campaignId: string }>(async (req, { campaignId }) => {
  await requireUser();
  const body = await parseJson(req, PatchDigestBody);
  const { user, campaign } = await requireCampaign(campaignId, "digest:send");
  const s: z.infer<typeof DigestScheduleResponse> = {
    digestWeekday: body.digestWeekday ?? campaign.digestWeekday,
    digestHour: body.digestHour ?? campaign.digestHour,
    timeZone: body.timeZone ?? campaign.timeZone,
  };
  await setSchedule(user, campaignId, s);
  return json(s);
});
