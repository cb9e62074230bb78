"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/server/action";
import { requireAdmin, requireCampaign } from "@/server/auth/guard";
import { inviteSchema, memberRoleSchema, removeMemberSchema } from "@/lib/validation/auth";
import { changeRole, removeMember, updateThresholds } from "@/server/services/campaigns";
import { invite } from "@/server/services/accounts";

export const inviteAction = formAction(inviteSchema, async ({ campaignId, email, role }) => {
  const admin = await requireAdmin();
  await requireCampaign(campaignId, "team:manage");
  await invite(admin, campaignId, email, role);
  revalidatePath(`/campaigns/${campaignId}/team`);
  return { ok: true, message: `Invitation sent to ${email}. The link works once, for 72 hours.` };
});

export const changeRoleAction = formAction(memberRoleSchema, async ({ campaignId, userId, role }) => {
  const admin = await requireAdmin();
  await requireCampaign(campaignId, "team:manage");
  await changeRole(admin, campaignId, userId, role);
  revalidatePath(`/campaigns/${campaignId}/team`);
  return { ok: true, message: "Role changed." };
});

export const removeMemberAction = formAction(removeMemberSchema, async ({ campaignId, userId }) => {
  const admin = await requireAdmin();
  await requireCampaign(campaignId, "team:manage");
  await removeMember(admin, campaignId, userId);
  revalidatePath(`/campaigns/${campaignId}/team`);
  return { ok: true, message: "Removed from the campaign; their sessions were ended." };
});

const thresholdsSchema = z.object({
  campaignId: z.string().uuid(),
  qcMinZPrime: z.coerce.number().min(-1, "Z′ is at least −1.").max(1, "Z′ is at most 1."),
  qcMaxCvPct: z.coerce.number().positive("Use a positive CV.").max(100),
  hitThresholdPct: z.coerce.number().min(0).max(100),
});

export const updateThresholdsAction = formAction(thresholdsSchema, async ({ campaignId, ...t }) => {
  const { user, campaign } = await requireCampaign(campaignId, "campaign:settings");
  await updateThresholds(user, campaign, t);
  revalidatePath(`/campaigns/${campaignId}`, "layout");
  return { ok: true, message: "Thresholds saved." };
});
