"use client";
import { useCallback, useMemo } from "react";
import useSWR, { useSWRConfig } from "swr";
import { fetchJson } from "./fetcher";
import { hitQueryString, type HitQueryParams, type SavedViewState } from "@/lib/hits/query";
import type { HitItem } from "@/lib/hits/item";

export type { HitItem };
export type HitPage = { items: HitItem[]; total: number; limit: number; offset: number };

export const hitsBase = (campaignId: string) => `/api/campaigns/${campaignId}/hits`;
export const hitsUrl = (campaignId: string, q: HitQueryParams, limit: number, offset: number) =>
  `${hitsBase(campaignId)}?${hitQueryString(q, { limit, offset })}`;
export const hitsExportUrl = (campaignId: string, q: HitQueryParams, format: "xlsx" | "csv") =>
  `${hitsBase(campaignId)}/export?${hitQueryString({ ...q, format })}`;
export const hitStructureUrl = (campaignId: string, registryId: string, size: "thumb" | "large" = "thumb") =>
  `${hitsBase(campaignId)}/${encodeURIComponent(registryId)}/structure${size === "large" ? "?size=large" : ""}`;

/**
 * The grid's data source: each block AG Grid's infinite row model asks for is fetched through
 * SWR's cache (the same key is not fetched twice while fresh), from the same route the API
 * documents. `invalidate` drops every cached page after a change.
 */
export function useHitPages(campaignId: string) {
  const { cache, mutate } = useSWRConfig();
  const load = useCallback(
    async (q: HitQueryParams, limit: number, offset: number): Promise<HitPage> => {
      const key = hitsUrl(campaignId, q, limit, offset);
      const hit = cache.get(key)?.data as HitPage | undefined;
      if (hit) return hit;
      const page = await mutate(key, fetchJson<HitPage>(key), { revalidate: false });
      return page!;
    },
    [campaignId, cache, mutate],
  );
  const invalidate = useCallback(() => {
    // Synchronously forget every cached page of this campaign (SWR's default cache is a Map).
    const prefix = `${hitsBase(campaignId)}?`;
    for (const k of [...cache.keys()]) if (k.startsWith(prefix)) cache.delete(k);
  }, [campaignId, cache]);
  return useMemo(() => ({ load, invalidate }), [load, invalidate]);
}

export type HitDetail = {
  row: HitItem;
  compound: {
    registryId: string;
    name: string | null;
    smiles: string;
    formula: string;
    mw: number;
    clogp: number;
    heavyAtoms: number;
  } | null;
  results: {
    kind: "single-dose" | "dose-response" | "mechanism";
    experimentId: string;
    experimentName: string;
    substrateUm: number | null;
    analysedAt: string | null;
    nPoints: number;
    flags: string[];
    override: { model: string; reason: string } | null;
    detail: unknown;
  }[];
  batches: {
    batchNumber: number;
    supplier: string | null;
    purityPct: number | null;
    saltForm: string | null;
    batchDate: string | null;
  }[];
  history: {
    id: string;
    from: string;
    to: string;
    fromLabel: string;
    toLabel: string;
    comment: string | null;
    at: string;
    by: string | null;
  }[];
  comments: { id: string; body: string; at: string; by: string | null }[];
};

export function useHitDetail(campaignId: string, registryId: string | null) {
  return useSWR<HitDetail>(registryId ? `${hitsBase(campaignId)}/${encodeURIComponent(registryId)}` : null, fetchJson, {
    revalidateOnFocus: false,
  });
}

export type SavedView = { id: string; name: string; state: SavedViewState; updatedAt: string };

export function useHitViews(campaignId: string) {
  return useSWR<{ items: SavedView[] }>(`${hitsBase(campaignId)}/views`, fetchJson, { revalidateOnFocus: false });
}

const send = (url: string, method: string, body?: unknown) =>
  fetchJson<unknown>(url, {
    method,
    headers: body === undefined ? undefined : { "content-type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });

export const hitActions = {
  setStatus: (campaignId: string, registryId: string, status: string, comment?: string) =>
    send(`${hitsBase(campaignId)}/${encodeURIComponent(registryId)}`, "PATCH", {
      status,
      comment: comment || undefined,
    }),
  setStatusMany: (campaignId: string, registryIds: string[], status: string, comment?: string) =>
    send(hitsBase(campaignId), "PATCH", { registryIds, status, comment: comment || undefined }) as Promise<{
      changed: number;
      unchanged: number;
    }>,
  comment: (campaignId: string, registryId: string, body: string) =>
    send(`${hitsBase(campaignId)}/${encodeURIComponent(registryId)}/comments`, "POST", { body }),
  saveView: (campaignId: string, name: string, state: SavedViewState) =>
    send(`${hitsBase(campaignId)}/views`, "POST", { name, state }),
  deleteView: (campaignId: string, id: string) => send(`${hitsBase(campaignId)}/views/${id}`, "DELETE"),
};
