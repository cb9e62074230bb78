import { requireUser } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { revokeToken } from "@/server/services/tokens";

export const dynamic = "force-dynamic";

/** Revokes one of one's own tokens at once (a read token cannot; another person's token is 404). */
export const DELETE = route<{ tokenId: string }>(async (_req, { tokenId }) => {
  const user = await requireUser();
  return json(await revokeToken(user, tokenId));
});
