"use client";
import useSWR from "swr";
import { fetchJson } from "./fetcher";
import { apiPaths } from "./api-paths";
import type { TokenListItem } from "@/server/services/tokens/manage";
import type { TokenScope } from "@/lib/api-tokens";

export type { TokenListItem };

/** GET /api/tokens: one's own personal API tokens. */
export function useTokens() {
  return useSWR<{ items: TokenListItem[] }>(apiPaths.tokens, fetchJson);
}

/** POST /api/tokens: the answer holds the secret, the only time it is sent. */
export function createToken(body: { name: string; scope: TokenScope; campaignIds?: string[]; expiresInDays?: number }) {
  return fetchJson<{ id: string; token: string; expiresAt: string }>(apiPaths.tokens, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
}

/** DELETE /api/tokens/{id}. */
export function revokeToken(id: string) {
  return fetchJson<{ id: string; revokedAt: string }>(apiPaths.token(id), { method: "DELETE" });
}
