import { requireSessionUser, requireUser } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { createToken, listTokens } from "@/server/services/tokens";
import { PostTokensBody } from "./schema";

export const dynamic = "force-dynamic";

/** One's own personal API tokens (signed in, or any token of one's own). */
export const GET = route(async () => {
  const user = await requireUser();
  return json({ items: await listTokens(user) });
});

/** Creates a personal API token; a browser session only (a token cannot mint tokens). The secret is in this answer only. */
export const POST = route(async (req) => {
  const user = await requireSessionUser();
  const body = await parseJson(req, PostTokensBody);
  return json(await createToken(user, body), 201);
});
