"use server";
import { redirect } from "next/navigation";
import { formAction } from "@/server/action";
import { requireUser } from "@/server/auth/guard";
import { changePasswordSchema } from "@/lib/validation/auth";
import { changePassword } from "@/server/services/accounts";
import { startSession } from "@/server/auth/session";

/** Changing the password ends every session of the user, this one included; a new one is started here. */
export const changePasswordAction = formAction(changePasswordSchema, async ({ current, password }) => {
  const user = await requireUser();
  await changePassword(user, current, password);
  await startSession(user.id);
  redirect("/settings?changed=1");
});
