"use server";
import { redirect } from "next/navigation";
import { formAction } from "@/server/action";
import { signInSchema, resetRequestSchema, resetSchema, acceptInviteSchema } from "@/lib/validation/auth";
import { checkCredentials, requestPasswordReset, resetPassword, acceptInvitation } from "@/server/services/accounts";
import { clientAddress } from "@/server/auth/guard";
import { startSession, endCurrentSession } from "@/server/auth/session";
import { safeNextPath } from "@/server/auth/redirect";

export const signInAction = formAction(signInSchema, async ({ email, password, next }) => {
  const userId = await checkCredentials(email, password, await clientAddress());
  await startSession(userId);
  redirect(safeNextPath(next));
});

export async function signOutAction(): Promise<void> {
  await endCurrentSession();
  redirect("/sign-in");
}

export const requestResetAction = formAction(resetRequestSchema, async ({ email }) => {
  await requestPasswordReset(email, await clientAddress());
  return {
    ok: true,
    message:
      "If an account uses that address, a link to choose a new password is on its way. It works once, for one hour.",
  };
});

export const resetPasswordAction = formAction(resetSchema, async ({ token, password }) => {
  const userId = await resetPassword(token, password, await clientAddress());
  await startSession(userId);
  redirect("/campaigns");
});

export const acceptInviteAction = formAction(acceptInviteSchema, async ({ token, name, password }) => {
  const userId = await acceptInvitation(token, { name, password }, await clientAddress());
  await startSession(userId);
  redirect("/campaigns");
});
