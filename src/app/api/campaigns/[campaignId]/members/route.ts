import { requireCampaign, requireUser } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { memberNamesOf, membersOf, pendingInvitations } from "@/server/services/campaigns";
import { invite } from "@/server/services/accounts";
import { PostMemberBody, PostMemberResponse } from "./schema";
import type { z } from "zod";

export const dynamic = "force-dynamic";

/**
 * The campaign's team, as the team page shows it: project leads and admins get each member's
 * id, e-mail, role and since when, and the pending invitations; any other member gets names and
 * roles only (`userId` and `email` null, no invitations).
 */
export const GET = route<{ campaignId: string }>(async (_req, { campaignId }) => {
  const { user, role } = await requireCampaign(campaignId);
  const manages = user.globalRole === "admin" || role === "lead";
  if (!manages) {
    const names = await memberNamesOf(campaignId);
    return json({
      items: names.map((m) => ({ userId: null, email: null, name: m.name, role: m.role, addedAt: m.addedAt })),
      invitations: null,
    });
  }
  const [items, invites] = await Promise.all([membersOf(campaignId), pendingInvitations(campaignId)]);
  return json({ items, invitations: invites });
});

/**
 * Invites a person (administrators; audited): an e-mail with a one-time link valid for 72 hours.
 * 201 `{ invitationId, email, role, expiresAt }`; the link itself goes only to the invitee.
 */
export const POST = route<{ campaignId: string }>(async (req, { campaignId }) => {
  await requireUser();
  const body = await parseJson(req, PostMemberBody);
  const { user } = await requireCampaign(campaignId, "team:manage");
  const { id, expiresAt } = await invite(user, campaignId, body.email, body.role);
  const answer: z.infer<typeof PostMemberResponse> = {
    invitationId: id,
    email: body.email,
    role: body.role,
    expiresAt: expiresAt.toISOString(),
  };
  return json(answer, 201);
});
