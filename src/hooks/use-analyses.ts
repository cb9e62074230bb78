"use client";
import useSWR from "swr";
import { fetchJson } from "./fetcher";
import { apiPaths } from "./api-paths";
import type { AnalysisJson } from "@/server/services/analyses";

export type { AnalysisJson };

/** Follows one analysis (every second until it is done or failed); no request when `analysisId` is undefined. */
export function useAnalysisProgress(campaignId: string, experimentId: string, analysisId: string | undefined) {
  return useSWR<AnalysisJson>(analysisId ? apiPaths.analysis(campaignId, experimentId, analysisId) : null, fetchJson, {
    refreshInterval: (d) => (d && (d.status === "done" || d.status === "failed") ? 0 : 1000),
  });
}
