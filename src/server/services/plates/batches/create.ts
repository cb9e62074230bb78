import "server-only";
import crypto from "node:crypto";
import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns, plateBatches, plateBatchFiles, plateMaps } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { putObject } from "@/server/storage/s3";
import type { Actor } from "@/server/auth/actor";
import { MAX_FILE_BYTES } from "@/lib/plates/reader-export";
import { audit } from "../../audit";
import { cleanFileName } from "../upload";
import { isZipName, MAX_BATCH_FILES, unpackBatchZip } from "./zip";
import { matchPlateMap, parseManifest, type ManifestRow } from "./match";
import { processBatch } from "./process";

type Campaign = typeof campaigns.$inferSelect;
const MIB = 1024 * 1024;

export type BatchUploadFile = { name: string; contentType: string; bytes: Uint8Array };
export type BatchUploadInput = {
  files: BatchUploadFile[];
  manifest?: Uint8Array | null;
  /** used for files that the manifest, header and file name leave unmatched */
  defaultPlateMapId?: string | null;
};

export const batchKeyFor = (sha256: string) => `plate-batches/sha256/${sha256}`;

/**
 * A day's plates in one upload. Zips are unpacked behind the zip checks; every file is
 * checksummed and stored in the object store; its plate map is matched (manifest, header
 * barcode, file name, default); then the batch row and every file row are written in ONE
 * transaction (matched files `pending`, the rest `unmatched` or `refused`), so the batch is
 * readable before any file is parsed. Each pending file is then parsed on its own through the
 * ordinary upload path (`processBatch`); `wait: false` returns before that finishes (the page
 * polls the batch for its progress bar).
 */
export async function createBatch(
  actor: Actor,
  campaign: Campaign,
  input: BatchUploadInput,
  opts: { wait?: boolean } = {},
): Promise<{ id: string; processing: Promise<void> }> {
  if (input.files.length === 0) throw new AppError("bad_request", "file: attach reader exports or one .zip of them.");
  const files: BatchUploadFile[] = [];
  for (const f of input.files) {
    if (isZipName(f.name, f.bytes)) {
      const zipName = cleanFileName(f.name);
      for (const e of await unpackBatchZip(zipName, f.bytes))
        files.push({ name: e.name, contentType: "application/octet-stream", bytes: e.bytes });
    } else files.push(f);
    if (files.length > MAX_BATCH_FILES)
      throw new AppError("bad_request", `A batch has at most ${MAX_BATCH_FILES} files; this one has more.`);
  }
  const manifestRows: ManifestRow[] = input.manifest ? parseManifest(input.manifest) : [];
  const manifest = input.manifest
    ? new Map(manifestRows.map((r) => [(r.fileName.split(/[\\/]/).pop() ?? r.fileName).trim().toLowerCase(), r]))
    : null;
  const maps = await db
    .select({ id: plateMaps.id, name: plateMaps.name })
    .from(plateMaps)
    .where(eq(plateMaps.campaignId, campaign.id));
  if (input.defaultPlateMapId && !maps.some((m) => m.id === input.defaultPlateMapId))
    throw new AppError("not_found", "plateMapId: no such plate map in this campaign.");

  const rows: Omit<typeof plateBatchFiles.$inferInsert, "batchId">[] = [];
  for (const [position, f] of files.entries()) {
    const fileName = cleanFileName(f.name);
    const sha256 = crypto.createHash("sha256").update(f.bytes).digest("hex");
    const contentType = (f.contentType || "application/octet-stream").slice(0, 100);
    const key = batchKeyFor(sha256);
    // Stored and checksummed before anything parses it (the store verifies the SHA-256).
    await putObject(key, f.bytes, contentType, sha256);
    const tooLarge = f.bytes.byteLength > MAX_FILE_BYTES;
    const m = matchPlateMap(f.name, f.bytes, maps, manifest, input.defaultPlateMapId ?? null);
    rows.push({
      position,
      fileName,
      contentType,
      sizeBytes: f.bytes.byteLength,
      sha256,
      s3Key: key,
      barcode: m.barcode,
      plateMapId: m.plateMapId,
      matchedBy: m.matchedBy,
      outcome: tooLarge ? ("refused" as const) : m.plateMapId ? ("pending" as const) : ("unmatched" as const),
      message: tooLarge
        ? `${fileName}: file is ${(f.bytes.byteLength / MIB).toFixed(1)} MB; the limit is ${MAX_FILE_BYTES / MIB} MB`
        : (m.message ?? null),
    });
  }
  const label = input.files.length === 1 ? cleanFileName(input.files[0]!.name) : `${files.length} files`;
  const id = await db.transaction(async (tx) => {
    const [batch] = await tx
      .insert(plateBatches)
      .values({ campaignId: campaign.id, label, fileCount: rows.length, createdBy: actor.id })
      .returning({ id: plateBatches.id });
    await tx.insert(plateBatchFiles).values(rows.map((r) => ({ ...r, batchId: batch!.id })));
    await audit(tx, actor, {
      campaignId: campaign.id,
      action: "plate_batch.upload",
      entityType: "plate_batch",
      entityId: batch!.id,
      after: {
        label,
        files: rows.length,
        pending: rows.filter((r) => r.outcome === "pending").length,
        unmatched: rows.filter((r) => r.outcome === "unmatched").length,
      },
    });
    return batch!.id;
  });
  const bytes = new Map(files.map((f, i) => [i, f.bytes]));
  const processing = processBatch(actor, campaign, id, bytes).catch((e) =>
    console.error("[inhibitrack] plate batch processing stopped", id, e),
  );
  if (opts.wait) await processing;
  return { id, processing };
}
