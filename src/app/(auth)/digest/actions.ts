"use server";
import { z } from "zod";
import { formAction } from "@/server/action";
import { AppError } from "@/server/errors";
import { OPT_OUT_LINK_DAYS, stopDigestByLink } from "@/server/services/digest";

/**
 * Stops the weekly digest from the e-mail's link, without signing in. The token is signed for
 * one person and one campaign, expires, and works only while that person is still a member.
 */
export const stopDigestAction = formAction(z.object({ token: z.string().min(10).max(600) }), async ({ token }) => {
  if (!(await stopDigestByLink(token)))
    throw new AppError(
      "bad_request",
      `This link is not valid: it may be altered, older than ${OPT_OUT_LINK_DAYS} days, or for a campaign you have left. Stop the digest in your settings after signing in.`,
    );
  return {
    ok: true,
    message:
      "Done: you will not receive this campaign's weekly digest any more. You can turn it back on in your settings.",
  };
});
