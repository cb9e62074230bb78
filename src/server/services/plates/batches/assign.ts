import "server-only";
import crypto from "node:crypto";
import { and, eq, inArray } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns, plateBatchFiles, plateMaps } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { getObject } from "@/server/storage/s3";
import type { Actor } from "@/server/auth/actor";
import { recordResult, uploadOne, type FileResult } from "./process";

type Campaign = typeof campaigns.$inferSelect;

/**
 * A person picks the plate map of a file the batch left `unmatched` (or `refused`, e.g. read
 * against the wrong map): the stored bytes are read back, their SHA-256 checked, and the file
 * goes through the ordinary upload path. The file row is claimed first (set to `pending` only if
 * it is still unmatched/refused), so two people assigning at once do not upload it twice.
 */
export async function assignBatchFile(
  actor: Actor,
  campaign: Campaign,
  batchId: string,
  fileId: string,
  plateMapId: string,
): Promise<FileResult & { fileId: string }> {
  const [map] = await db
    .select({ id: plateMaps.id })
    .from(plateMaps)
    .where(and(eq(plateMaps.id, plateMapId), eq(plateMaps.campaignId, campaign.id)));
  const [file] = await db
    .select()
    .from(plateBatchFiles)
    .where(and(eq(plateBatchFiles.id, fileId), eq(plateBatchFiles.batchId, batchId)));
  // The batch must belong to this campaign: checked through its files' plate maps would miss
  // unmatched files, so the batch row is joined here.
  const owned = file
    ? await db.query.plateBatches.findFirst({
        where: (b, { and: both, eq: is }) => both(is(b.id, batchId), is(b.campaignId, campaign.id)),
        columns: { id: true },
      })
    : undefined;
  if (!file || !owned) throw new AppError("not_found", "No such file in this plate batch.");
  if (!map) throw new AppError("not_found", "plateMapId: no such plate map in this campaign.");
  const [claimed] = await db
    .update(plateBatchFiles)
    .set({ outcome: "pending", plateMapId, matchedBy: "person", message: null, updatedAt: new Date() })
    .where(and(eq(plateBatchFiles.id, fileId), inArray(plateBatchFiles.outcome, ["unmatched", "refused"])))
    .returning();
  if (!claimed)
    throw new AppError(
      "conflict",
      `${file.fileName} is ${file.outcome}; only an unmatched or refused file can be assigned.`,
    );
  let result: FileResult;
  try {
    const bytes = await getObject(claimed.s3Key);
    const sha = crypto.createHash("sha256").update(bytes).digest("hex");
    result =
      sha === claimed.sha256
        ? await uploadOne(actor, campaign, claimed, bytes)
        : { outcome: "refused", message: `${claimed.fileName}: the stored file no longer matches its SHA-256` };
  } catch (e) {
    await recordResult(fileId, { outcome: file.outcome, message: file.message });
    throw e;
  }
  await recordResult(fileId, result);
  return { fileId, ...result };
}
