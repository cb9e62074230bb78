import { z } from "zod";

/** Query of POST /api/campaigns/{campaignId}/plate-batches: `wait=true` answers when every file is processed. */
export const PostPlateBatchQuery = z.object({
  wait: z.enum(["true", "false"]).optional(),
});

/**
 * Multipart fields of POST /api/campaigns/{campaignId}/plate-batches (several `file` parts are
 * read, not just the first): `file` (reader exports, or one .zip of them), optional `manifest`
 * (CSV `file_name,barcode,plate_map`), optional `plateMapId` (for files nothing else matches).
 */
export const PostPlateBatchForm = z.object({
  file: z
    .array(z.instanceof(File, { message: "file: attach reader exports (CSV, TSV, XLSX) or one .zip of them" }))
    .min(1, "file: attach reader exports (CSV, TSV, XLSX) or one .zip of them"),
  manifest: z.instanceof(File, { message: "manifest: attach a CSV file_name,barcode,plate_map" }).optional(),
  plateMapId: z.string().uuid("plateMapId must be a plate map id").optional(),
});

export const BatchFileOutcomeEnum = z.enum(["pending", "stored", "duplicate", "refused", "unmatched"]);

export const PlateBatchFile = z.object({
  id: z.string().uuid(),
  position: z.number().int(),
  fileName: z.string(),
  sizeBytes: z.number().int(),
  sha256: z.string(),
  barcode: z.string().nullable(),
  plateMapId: z.string().uuid().nullable(),
  plateMapName: z.string().nullable(),
  matchedBy: z.string().nullable(),
  outcome: BatchFileOutcomeEnum,
  message: z.string().nullable(),
  runId: z.string().uuid().nullable(),
  existingRunId: z.string().uuid().nullable(),
  run: z
    .object({
      id: z.string().uuid(),
      format: z.number().int(),
      wells: z.number().int(),
      zPrime: z.number().nullable(),
      signalToBackground: z.number().nullable(),
      cvNeutralPct: z.number().nullable(),
      cvFullPct: z.number().nullable(),
      verdict: z.enum(["pass", "fail"]),
      reasons: z.array(z.string()),
      decision: z.string(),
    })
    .nullable(),
});

/** Answer of POST (201 when waited for, 202 while processing) and GET …/plate-batches/{batchId}. */
export const PlateBatchResponse = z.object({
  id: z.string().uuid(),
  campaignId: z.string().uuid(),
  label: z.string(),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
  status: z.enum(["processing", "done", "interrupted"]),
  counts: z.record(z.string(), z.number().int()),
  files: z.array(PlateBatchFile),
});
