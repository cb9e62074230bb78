import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns, plateBatches, plateBatchFiles } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { getObject } from "@/server/storage/s3";
import type { Actor } from "@/server/auth/actor";
import type { BatchFileOutcome } from "@/lib/plates/batch-outcomes";
import { uploadRun } from "../upload";

type Campaign = typeof campaigns.$inferSelect;
type FileRow = typeof plateBatchFiles.$inferSelect;

/** Files parsed at once: the upload-parse pool has two workers (src/server/workers/upload-parse-pool.ts). */
const CONCURRENCY = 2;
const inFlight = new Set<string>();

/** Whether this server process is still working on the batch (a batch left pending by a crash is not). */
export const batchInFlight = (batchId: string) => inFlight.has(batchId);

export type FileResult = {
  outcome: BatchFileOutcome;
  runId?: string | null;
  existingRunId?: string | null;
  message?: string | null;
};

/**
 * One file through the ordinary upload path (uploadRun: duplicate check, parse in the worker
 * pool, check against the plate map, QC, one transaction). What it throws becomes the file's
 * outcome: a 409 with the earlier run is `duplicate`, any other refusal is `refused` with its
 * sentence (and the first few well/line details).
 */
export async function uploadOne(actor: Actor, campaign: Campaign, f: FileRow, bytes: Uint8Array): Promise<FileResult> {
  try {
    const run = await uploadRun(actor, campaign, {
      plateMapId: f.plateMapId!,
      fileName: f.fileName,
      contentType: f.contentType,
      bytes,
      barcode: f.barcode,
    });
    return { outcome: "stored", runId: run.id, message: null };
  } catch (e) {
    if (e instanceof AppError) {
      const existing = e.extra?.runId;
      if (e.code === "conflict" && typeof existing === "string")
        return { outcome: "duplicate", existingRunId: existing, message: e.message };
      if (e.code === "internal") throw e;
      const more = (e.details ?? [])
        .slice(0, 3)
        .map((d) =>
          [d.line ? `line ${d.line}` : "", d.well ? `well ${d.well}` : "", d.message].filter(Boolean).join(": "),
        )
        .filter((d) => d && d !== e.message);
      return { outcome: "refused", message: [e.message, ...more].join(" · ").slice(0, 1000) };
    }
    console.error("[inhibitrack] plate batch file failed", f.id, e);
    return {
      outcome: "refused",
      message: `${f.fileName}: the file could not be processed (the error has been logged)`,
    };
  }
}

export async function recordResult(fileId: string, r: FileResult): Promise<void> {
  await db
    .update(plateBatchFiles)
    .set({
      outcome: r.outcome,
      runId: r.runId ?? null,
      existingRunId: r.existingRunId ?? null,
      message: r.message ?? null,
      updatedAt: new Date(),
    })
    .where(eq(plateBatchFiles.id, fileId));
}

/**
 * Parses every pending file of a batch, two at a time, each on its own: one bad or duplicate file
 * is recorded and the others go on. Each file's outcome is written as soon as it is known, so
 * the batch can be read (and a progress bar drawn) while it runs. `bytes` (by position) saves
 * reading the files back from the object store when the same request stored them.
 */
export async function processBatch(
  actor: Actor,
  campaign: Campaign,
  batchId: string,
  bytes: Map<number, Uint8Array> = new Map(),
): Promise<void> {
  inFlight.add(batchId);
  try {
    const pending = await db
      .select()
      .from(plateBatchFiles)
      .where(and(eq(plateBatchFiles.batchId, batchId), eq(plateBatchFiles.outcome, "pending")))
      .orderBy(asc(plateBatchFiles.position));
    let next = 0;
    const lane = async () => {
      while (next < pending.length) {
        const f = pending[next++]!;
        const data = bytes.get(f.position) ?? (await getObject(f.s3Key));
        bytes.delete(f.position);
        await recordResult(f.id, await uploadOne(actor, campaign, f, data));
      }
    };
    await Promise.all(Array.from({ length: CONCURRENCY }, lane));
    await db.update(plateBatches).set({ finishedAt: new Date() }).where(eq(plateBatches.id, batchId));
  } finally {
    inFlight.delete(batchId);
  }
}
