"use server";
import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/server/action";
import { clientAddress, requireCampaign, requireUser } from "@/server/auth/guard";
import { optIn, optOut } from "@/server/services/digest";
import { changePasswordSchema } from "@/lib/validation/auth";
import { changePassword } from "@/server/services/accounts";
import { getCurrentSession } from "@/server/auth/session";

/** Changing the password ends every other session of the user; this one stays signed in. */
export const changePasswordAction = formAction(changePasswordSchema, async ({ current, password }) => {
  const user = await requireUser();
  const { sessionId } = await getCurrentSession();
  await changePassword(user, current, password, { address: await clientAddress(), keepSessionId: sessionId });
  redirect("/settings?changed=1");
});

export const setMyDigestAction = formAction(
  z.object({ campaignId: z.string().uuid(), receive: z.enum(["0", "1"]) }),
  async ({ campaignId, receive }) => {
    const user = await requireUser();
    await requireCampaign(campaignId);
    if (receive === "1") await optIn(user.id, campaignId);
    else await optOut(user.id, campaignId, "settings");
    revalidatePath("/settings");
    return {
      ok: true,
      message:
        receive === "1"
          ? "You will receive this campaign's weekly digest."
          : "You will not receive this campaign's weekly digest.",
    };
  },
);
