import { z } from "zod";
import { email, roleSchema } from "@/lib/validation/auth";

/** Body of POST /api/campaigns/{campaignId}/members: invite a person by e-mail with a campaign role. */
export const PostMemberBody = z.strictObject({ email, role: roleSchema });

/** Path of …/members/{userId}. */
export const memberParams = z.object({
  campaignId: z.string().uuid(),
  userId: z.string().trim().min(1, "userId is empty.").max(100, "userId is too long."),
});

/** Body of PATCH …/members/{userId}: the member's new campaign role. */
export const PatchMemberBody = z.strictObject({ role: roleSchema });

/** Answer of POST …/members (201): the invitation (its link goes only to the invitee). */
export const PostMemberResponse = z.object({
  invitationId: z.string().uuid(),
  email: z.string(),
  role: roleSchema,
  expiresAt: z.string().datetime(),
});

/** Answer of PATCH …/members/{userId}. */
export const PatchMemberResponse = z.object({ userId: z.string(), role: roleSchema });
