import "server-only";
import crypto from "node:crypto";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { plateMaps, plateRuns, plateWellMasks, users, wellReadings } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { getObject } from "@/server/storage/s3";

export async function listRuns(campaignId: string) {
  return db
    .select({
      id: plateRuns.id,
      fileName: plateRuns.fileName,
      barcode: plateRuns.barcode,
      plateMapId: plateRuns.plateMapId,
      plateMapName: plateMaps.name,
      format: plateRuns.format,
      readout: plateRuns.readout,
      reads: plateRuns.reads,
      wellCount: plateRuns.wellCount,
      zPrime: plateRuns.zPrime,
      qc: plateRuns.qc,
      qcVerdict: plateRuns.qcVerdict,
      decision: plateRuns.decision,
      uploadedAt: plateRuns.uploadedAt,
      uploadedBy: users.name,
    })
    .from(plateRuns)
    .innerJoin(plateMaps, eq(plateMaps.id, plateRuns.plateMapId))
    .leftJoin(users, eq(users.id, plateRuns.uploadedBy))
    .where(eq(plateRuns.campaignId, campaignId))
    .orderBy(desc(plateRuns.uploadedAt), desc(plateRuns.fileName));
}

export async function getRunDetail(campaignId: string, runId: string) {
  const [run] = await db
    .select({
      run: plateRuns,
      plateMapName: plateMaps.name,
      signalDirection: plateMaps.signalDirection,
      uploadedByName: users.name,
    })
    .from(plateRuns)
    .innerJoin(plateMaps, eq(plateMaps.id, plateRuns.plateMapId))
    .leftJoin(users, eq(users.id, plateRuns.uploadedBy))
    .where(and(eq(plateRuns.id, runId), eq(plateRuns.campaignId, campaignId)));
  if (!run) throw new AppError("not_found", "No such plate run in this campaign.");
  const [decider] = run.run.decidedBy
    ? await db.select({ name: users.name }).from(users).where(eq(users.id, run.run.decidedBy))
    : [];
  const readings = await db
    .select()
    .from(wellReadings)
    .where(eq(wellReadings.runId, runId))
    .orderBy(asc(wellReadings.wellIndex));
  const masks = await db
    .select({
      id: plateWellMasks.id,
      well: plateWellMasks.well,
      reason: plateWellMasks.reason,
      maskedAt: plateWellMasks.maskedAt,
      maskedBy: sql<string | null>`(select name from ${users} where ${users.id} = ${plateWellMasks.maskedBy})`,
      unmaskedAt: plateWellMasks.unmaskedAt,
      unmaskedBy: sql<string | null>`(select name from ${users} where ${users.id} = ${plateWellMasks.unmaskedBy})`,
      unmaskReason: plateWellMasks.unmaskReason,
    })
    .from(plateWellMasks)
    .where(eq(plateWellMasks.runId, runId))
    .orderBy(desc(plateWellMasks.maskedAt));
  return { ...run, decidedByName: decider?.name ?? null, readings, masks };
}

/** Z′ of every run over time, for the campaign's trend chart. */
export async function zPrimeTrend(campaignId: string) {
  return db
    .select({
      id: plateRuns.id,
      fileName: plateRuns.fileName,
      uploadedAt: plateRuns.uploadedAt,
      zPrime: plateRuns.zPrime,
      verdict: plateRuns.qcVerdict,
      decision: plateRuns.decision,
    })
    .from(plateRuns)
    .where(eq(plateRuns.campaignId, campaignId))
    .orderBy(asc(plateRuns.uploadedAt));
}

/** The raw file as uploaded, checked against its recorded SHA-256 before it is served. */
export async function getRawFile(campaignId: string, runId: string) {
  const [run] = await db
    .select({
      s3Key: plateRuns.s3Key,
      sha256: plateRuns.sha256,
      fileName: plateRuns.fileName,
      contentType: plateRuns.contentType,
    })
    .from(plateRuns)
    .where(and(eq(plateRuns.id, runId), eq(plateRuns.campaignId, campaignId)));
  if (!run) throw new AppError("not_found", "No such plate run in this campaign.");
  const bytes = await getObject(run.s3Key);
  const sha = crypto.createHash("sha256").update(bytes).digest("hex");
  if (sha !== run.sha256) {
    console.error("[inhibitrack] stored raw file does not match its checksum", runId, run.sha256, sha);
    throw new AppError("internal");
  }
  return { ...run, bytes };
}
