import { z } from "zod";

/** Body of PUT /api/me/digest: whether I receive one campaign's weekly digest. */
export const PutMyDigestBody = z.strictObject({
  campaignId: z.string().uuid("campaignId must be a campaign id."),
  receive: z.boolean({ error: "receive must be true or false." }),
});

/** Answer of GET /api/me/digest: one row per campaign the caller is a member of. */
export const GetMyDigestResponse = z.object({
  items: z.array(z.object({ campaignId: z.string().uuid(), campaignName: z.string(), receive: z.boolean() })),
});

/** Answer of PUT /api/me/digest. */
export const PutMyDigestResponse = PutMyDigestBody;
