import { requireCampaign, requireUser } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { changeRole, removeMember } from "@/server/services/campaigns";
import { memberParams, PatchMemberBody, PatchMemberResponse } from "../schema";
import type { z } from "zod";

export const dynamic = "force-dynamic";

type P = { campaignId: string; userId: string };

/** Changes a member's role (administrators; audited with the role before). 404 for a non-member. */
export const PATCH = route<P>(async (req, params) => {
  await requireUser();
  const { campaignId, userId } = memberParams.parse(params);
  const body = await parseJson(req, PatchMemberBody);
  const { user } = await requireCampaign(campaignId, "team:manage");
  await changeRole(user, campaignId, userId, body.role);
  return json({ userId, role: body.role } satisfies z.infer<typeof PatchMemberResponse>);
});

/** Removes a member (administrators; audited) and ends their sessions. 404 for a non-member. */
export const DELETE = route<P>(async (_req, params) => {
  await requireUser();
  const { campaignId, userId } = memberParams.parse(params);
  const { user } = await requireCampaign(campaignId, "team:manage");
  await removeMember(user, campaignId, userId);
  return json({ userId, removed: true });
});
