import { z } from "zod";
import { TOKEN_DEFAULT_DAYS, TOKEN_MAX_DAYS, TOKEN_SCOPES } from "@/lib/api-tokens";

/** Body of POST /api/tokens: a name, a scope, optionally chosen campaigns and an expiry in days. */
export const PostTokensBody = z.strictObject({
  name: z
    .string({ error: "name must be text." })
    .trim()
    .min(1, "Give the token a name (for example the script or machine that uses it).")
    .max(100, "A token name has at most 100 characters."),
  scope: z.enum(TOKEN_SCOPES, { error: 'scope is "read" or "read-write".' }),
  campaignIds: z
    .array(z.uuid({ error: "Each campaign id is a UUID." }), { error: "campaignIds is a list of campaign ids." })
    .max(200, "A token names at most 200 campaigns.")
    .optional(),
  expiresInDays: z
    .number({ error: "expiresInDays must be a number." })
    .int("expiresInDays must be a whole number of days.")
    .min(1, "A token lasts at least 1 day.")
    .max(TOKEN_MAX_DAYS, `A token lasts at most ${TOKEN_MAX_DAYS} days.`)
    .optional()
    .describe(`Days until the token expires; ${TOKEN_DEFAULT_DAYS} when left out.`),
});

/** 201 answer of POST /api/tokens. `token` is the secret, shown this once and never again. */
export const PostTokensResponse = z.object({
  id: z.uuid(),
  token: z.string(),
  expiresAt: z.iso.datetime(),
});

export const TokenListItem = z.object({
  id: z.uuid(),
  name: z.string(),
  scope: z.enum(TOKEN_SCOPES),
  campaigns: z.array(z.object({ id: z.uuid(), name: z.string().nullable() })).nullable(),
  createdAt: z.iso.datetime(),
  lastUsedAt: z.iso.datetime().nullable(),
  expiresAt: z.iso.datetime(),
  revokedAt: z.iso.datetime().nullable(),
  status: z.enum(["active", "expired", "revoked"]),
});

/** 200 answer of GET /api/tokens: one's own tokens, newest first (never their secrets). */
export const GetTokensResponse = z.object({ items: z.array(TokenListItem) });

/** 200 answer of DELETE /api/tokens/{tokenId}. */
export const DeleteTokenResponse = z.object({ id: z.uuid(), revokedAt: z.iso.datetime() });
