/**
 * Every API path the client uses, in one place (the JSON API is described in docs/api.md). Not a
 * client module, so server components may build links with it too (a download link on a page).
 */
import { hitQueryString, type HitQueryParams } from "@/lib/hits/query";

const enc = encodeURIComponent;

export const apiPaths = {
  tokens: "/api/tokens",
  token: (id: string) => `/api/tokens/${enc(id)}`,

  compounds: "/api/compounds",
  compoundImports: "/api/compound-imports",
  compoundImport: (id: string) => `/api/compound-imports/${enc(id)}`,
  compoundImportCommit: (id: string) => `/api/compound-imports/${enc(id)}/commit`,
  compoundImportReport: (id: string) => `/api/compound-imports/${enc(id)}/report`,

  plateRuns: (campaignId: string) => `/api/campaigns/${enc(campaignId)}/plate-runs`,
  plateRunPreview: (campaignId: string) => `/api/campaigns/${enc(campaignId)}/plate-runs/preview`,
  plateRunFile: (campaignId: string, runId: string) =>
    `/api/campaigns/${enc(campaignId)}/plate-runs/${enc(runId)}/file`,
  plateBatches: (campaignId: string) => `/api/campaigns/${enc(campaignId)}/plate-batches`,
  plateBatch: (campaignId: string, batchId: string) =>
    `/api/campaigns/${enc(campaignId)}/plate-batches/${enc(batchId)}`,
  plateBatchAcceptPassing: (campaignId: string, batchId: string) =>
    `/api/campaigns/${enc(campaignId)}/plate-batches/${enc(batchId)}/accept-passing`,
  plateBatchAssign: (campaignId: string, batchId: string, fileId: string) =>
    `/api/campaigns/${enc(campaignId)}/plate-batches/${enc(batchId)}/files/${enc(fileId)}/assign`,

  analysis: (campaignId: string, experimentId: string, analysisId: string) =>
    `/api/campaigns/${enc(campaignId)}/experiments/${enc(experimentId)}/analyses/${enc(analysisId)}`,
  analysisRetry: (campaignId: string, experimentId: string, analysisId: string) =>
    `${apiPaths.analysis(campaignId, experimentId, analysisId)}/retry`,

  hits: (campaignId: string) => `/api/campaigns/${enc(campaignId)}/hits`,
  hitsPage: (campaignId: string, q: HitQueryParams, limit: number, offset: number) =>
    `${apiPaths.hits(campaignId)}?${hitQueryString(q, { limit, offset })}`,
  hitsExport: (campaignId: string, q: HitQueryParams, format: "xlsx" | "csv") =>
    `${apiPaths.hits(campaignId)}/export?${hitQueryString({ ...q, format })}`,
  hit: (campaignId: string, registryId: string) => `${apiPaths.hits(campaignId)}/${enc(registryId)}`,
  hitComments: (campaignId: string, registryId: string) => `${apiPaths.hit(campaignId, registryId)}/comments`,
  hitStructure: (campaignId: string, registryId: string, size: "thumb" | "large" = "thumb") =>
    `${apiPaths.hit(campaignId, registryId)}/structure${size === "large" ? "?size=large" : ""}`,
  hitViews: (campaignId: string) => `${apiPaths.hits(campaignId)}/views`,
  hitView: (campaignId: string, viewId: string) => `${apiPaths.hitViews(campaignId)}/${enc(viewId)}`,
} as const;
