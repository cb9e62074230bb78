"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/server/action";
import { requireCampaign } from "@/server/auth/guard";
import { sendCampaignDigest, setSchedule } from "@/server/services/digest";

export const sendDigestNowAction = formAction(z.object({ campaignId: z.string().uuid() }), async ({ campaignId }) => {
  const { user } = await requireCampaign(campaignId, "digest:send");
  const s = await sendCampaignDigest(campaignId, { trigger: "send-now", actor: user });
  revalidatePath(`/campaigns/${campaignId}/digest`);
  const parts = [
    `${s.sent} sent`,
    s.alreadySent ? `${s.alreadySent} had this week's digest already` : "",
    s.optedOut ? `${s.optedOut} opted out` : "",
    s.failed ? `${s.failed} failed (retried by the schedule)` : "",
  ].filter(Boolean);
  return { ok: true, message: `Week of ${s.week}: ${parts.join(", ")}.` };
});

const scheduleSchema = z.object({
  campaignId: z.string().uuid(),
  digestWeekday: z.coerce.number().int().min(1).max(7),
  digestHour: z.coerce.number().int().min(0, "Hour 0–23.").max(23, "Hour 0–23."),
  timeZone: z
    .string()
    .trim()
    .min(1)
    .max(64)
    .refine((tz) => {
      try {
        new Intl.DateTimeFormat("en-GB", { timeZone: tz });
        return true;
      } catch {
        return false;
      }
    }, "Not a known time zone (e.g. Europe/Berlin, America/New_York, UTC)."),
});

export const setDigestScheduleAction = formAction(scheduleSchema, async ({ campaignId, ...s }) => {
  const { user } = await requireCampaign(campaignId, "digest:send");
  await setSchedule(user, campaignId, s);
  revalidatePath(`/campaigns/${campaignId}/digest`);
  return { ok: true, message: "Schedule saved." };
});
