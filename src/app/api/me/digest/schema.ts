import { z } from "zod";

/** Body of PUT /api/me/digest: whether I receive one campaign's weekly digest. */
export const PutMyDigestBody = z.strictObject({
  campaignId: z.string().uuid("campaignId must be a campaign id."),
  receive: z.boolean({ error: "receive must be true or false." }),
});
