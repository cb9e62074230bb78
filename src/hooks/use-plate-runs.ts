"use client";
import { fetchJson } from "./fetcher";
import { apiPaths } from "./api-paths";
import type { RunPreview, RunSummary } from "@/server/services/plates";

export type { RunPreview, RunSummary };

function form(fields: Record<string, string>, file: File): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) if (v) f.append(k, v);
  f.append("file", file);
  return f;
}

/** Parse a reader export against a plate map; nothing is stored. ApiError (400, with details) when it is refused. */
export function previewPlateRun(campaignId: string, plateMapId: string, file: File): Promise<RunPreview> {
  return fetchJson<RunPreview>(apiPaths.plateRunPreview(campaignId), {
    method: "POST",
    body: form({ plateMapId }, file),
  });
}

/** Store, checksum and parse a reader export (201). A file stored before is ApiError 409 with `runId`. */
export function uploadPlateRun(
  campaignId: string,
  plateMapId: string,
  barcode: string,
  file: File,
): Promise<RunSummary> {
  return fetchJson<RunSummary>(apiPaths.plateRuns(campaignId), {
    method: "POST",
    body: form({ plateMapId, barcode }, file),
  });
}
