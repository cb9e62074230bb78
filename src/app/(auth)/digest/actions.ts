"use server";
import { z } from "zod";
import { formAction } from "@/server/action";
import { AppError } from "@/server/errors";
import { optOut, readOptOutToken } from "@/server/services/digest";

/**
 * Stops the weekly digest from the e-mail's link, without signing in. The token is signed for
 * one person and one campaign, so it cannot be used for anyone else.
 */
export const stopDigestAction = formAction(z.object({ token: z.string().min(10).max(600) }), async ({ token }) => {
  const who = readOptOutToken(token);
  if (!who)
    throw new AppError(
      "bad_request",
      "This link is not valid. Open it from the digest e-mail, or stop the digest in your settings.",
    );
  await optOut(who.userId, who.campaignId, "link");
  return {
    ok: true,
    message:
      "Done: you will not receive this campaign's weekly digest any more. You can turn it back on in your settings.",
  };
});
