"use client";
import { useCallback, useMemo } from "react";
import useSWR, { useSWRConfig } from "swr";
import { fetchJson } from "./fetcher";
import { apiPaths } from "./api-paths";
import type { hitDetail } from "@/server/services/hits";
import type { HitQueryParams, SavedViewState } from "@/lib/hits/query";
import type { HitItem } from "@/lib/hits/item";

export type { HitItem };
export type HitPage = { items: HitItem[]; total: number; limit: number; offset: number };

export const hitsExportUrl = apiPaths.hitsExport;
export const hitStructureUrl = apiPaths.hitStructure;

/**
 * The grid's data source: each block AG Grid's infinite row model asks for is fetched through
 * SWR's cache (the same key is not fetched twice while fresh), from the same route the API
 * documents. `invalidate` drops every cached page after a change.
 */
export function useHitPages(campaignId: string) {
  const { cache, mutate } = useSWRConfig();
  const load = useCallback(
    async (q: HitQueryParams, limit: number, offset: number): Promise<HitPage> => {
      const key = apiPaths.hitsPage(campaignId, q, limit, offset);
      const hit = cache.get(key)?.data as HitPage | undefined;
      if (hit) return hit;
      const page = await mutate(key, fetchJson<HitPage>(key), { revalidate: false });
      return page!;
    },
    [campaignId, cache, mutate],
  );
  const invalidate = useCallback(() => {
    // Synchronously forget every cached page of this campaign (SWR's default cache is a Map).
    const prefix = `${apiPaths.hits(campaignId)}?`;
    for (const k of [...cache.keys()]) if (k.startsWith(prefix)) cache.delete(k);
  }, [campaignId, cache]);
  return useMemo(() => ({ load, invalidate }), [load, invalidate]);
}

/** GET /api/campaigns/{id}/hits/{registryId}: the compound panel, as the server writes it. */
export type HitDetail = Awaited<ReturnType<typeof hitDetail>>;

export function useHitDetail(campaignId: string, registryId: string | null) {
  return useSWR<HitDetail>(registryId ? apiPaths.hit(campaignId, registryId) : null, fetchJson, {
    revalidateOnFocus: false,
  });
}

export type SavedView = { id: string; name: string; state: SavedViewState; updatedAt: string };

export function useHitViews(campaignId: string) {
  return useSWR<{ items: SavedView[] }>(apiPaths.hitViews(campaignId), fetchJson, { revalidateOnFocus: false });
}

const send = (url: string, method: string, body?: unknown) =>
  fetchJson<unknown>(url, {
    method,
    headers: body === undefined ? undefined : { "content-type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });

export const hitActions = {
  setStatus: (campaignId: string, registryId: string, status: string, comment?: string) =>
    send(apiPaths.hit(campaignId, registryId), "PATCH", {
      status,
      comment: comment || undefined,
    }),
  setStatusMany: (campaignId: string, registryIds: string[], status: string, comment?: string) =>
    send(apiPaths.hits(campaignId), "PATCH", { registryIds, status, comment: comment || undefined }) as Promise<{
      changed: number;
      unchanged: number;
    }>,
  comment: (campaignId: string, registryId: string, body: string) =>
    send(apiPaths.hitComments(campaignId, registryId), "POST", { body }),
  saveView: (campaignId: string, name: string, state: SavedViewState) =>
    send(apiPaths.hitViews(campaignId), "POST", { name, state }),
  deleteView: (campaignId: string, id: string) => send(apiPaths.hitView(campaignId, id), "DELETE"),
};
