"use server";
import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { formAction } from "@/server/action";
import { requireAdmin } from "@/server/auth/guard";
import { campaignSchema } from "@/lib/validation/auth";
import { createCampaign } from "@/server/services/campaigns";

export const createCampaignAction = formAction(campaignSchema, async (input) => {
  const user = await requireAdmin();
  const id = await createCampaign(user, input);
  revalidatePath("/campaigns");
  redirect(`/campaigns/${id}/team`);
});
