import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { plateBatches, plateBatchFiles, plateMaps, plateRuns, wellReadings } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { BatchFileOutcome } from "@/lib/plates/batch-outcomes";
import { batchInFlight } from "./process";

/** A batch left with pending files this long after its upload, by no running process, was interrupted. */
const STALE_MS = 10 * 60 * 1000;

export type BatchFileView = {
  id: string;
  position: number;
  fileName: string;
  sizeBytes: number;
  sha256: string;
  barcode: string | null;
  plateMapId: string | null;
  plateMapName: string | null;
  matchedBy: string | null;
  outcome: BatchFileOutcome;
  message: string | null;
  runId: string | null;
  existingRunId: string | null;
  run: null | {
    id: string;
    format: number;
    wells: number;
    zPrime: number | null;
    signalToBackground: number | null;
    cvNeutralPct: number | null;
    cvFullPct: number | null;
    verdict: "pass" | "fail";
    reasons: string[];
    decision: string;
  };
};

export type BatchView = {
  id: string;
  campaignId: string;
  label: string;
  createdAt: string;
  finishedAt: string | null;
  /** "processing" while files are pending in a running process; "interrupted" when they were left pending */
  status: "processing" | "done" | "interrupted";
  counts: Record<BatchFileOutcome, number> & { total: number; pass: number; fail: number; accepted: number };
  files: BatchFileView[];
};

export async function getBatch(campaignId: string, batchId: string): Promise<BatchView> {
  const [b] = await db
    .select()
    .from(plateBatches)
    .where(and(eq(plateBatches.id, batchId), eq(plateBatches.campaignId, campaignId)));
  if (!b) throw new AppError("not_found", "No such plate batch in this campaign.");
  const rows = await db
    .select({
      f: plateBatchFiles,
      mapName: plateMaps.name,
      run: {
        id: plateRuns.id,
        format: plateRuns.format,
        wells: plateRuns.wellCount,
        qc: plateRuns.qc,
        zPrime: plateRuns.zPrime,
        verdict: plateRuns.qcVerdict,
        decision: plateRuns.decision,
      },
    })
    .from(plateBatchFiles)
    .leftJoin(plateMaps, eq(plateMaps.id, plateBatchFiles.plateMapId))
    .leftJoin(plateRuns, eq(plateRuns.id, plateBatchFiles.runId))
    .where(eq(plateBatchFiles.batchId, batchId))
    .orderBy(asc(plateBatchFiles.position));
  const files: BatchFileView[] = rows.map(({ f, mapName, run }) => ({
    id: f.id,
    position: f.position,
    fileName: f.fileName,
    sizeBytes: f.sizeBytes,
    sha256: f.sha256,
    barcode: f.barcode,
    plateMapId: f.plateMapId,
    plateMapName: mapName,
    matchedBy: f.matchedBy,
    outcome: f.outcome,
    message: f.message,
    runId: f.runId,
    existingRunId: f.existingRunId,
    run:
      run && run.id
        ? {
            id: run.id,
            format: run.format,
            wells: run.wells,
            zPrime: run.zPrime,
            signalToBackground: run.qc.signalToBackground,
            cvNeutralPct: run.qc.cvNeutralPct,
            cvFullPct: run.qc.cvFullPct,
            verdict: run.verdict,
            reasons: run.qc.reasons,
            decision: run.decision,
          }
        : null,
  }));
  const counts = {
    pending: 0,
    stored: 0,
    duplicate: 0,
    refused: 0,
    unmatched: 0,
    total: files.length,
    pass: 0,
    fail: 0,
    accepted: 0,
  };
  for (const f of files) {
    counts[f.outcome]++;
    if (f.run) {
      counts[f.run.verdict]++;
      if (f.run.decision === "accepted") counts.accepted++;
    }
  }
  const status =
    counts.pending === 0
      ? "done"
      : batchInFlight(b.id) || Date.now() - b.createdAt.getTime() < STALE_MS
        ? "processing"
        : "interrupted";
  return {
    id: b.id,
    campaignId: b.campaignId,
    label: b.label,
    createdAt: b.createdAt.toISOString(),
    finishedAt: b.finishedAt?.toISOString() ?? null,
    status,
    counts,
    files,
  };
}

export async function listBatches(campaignId: string, limit = 10) {
  return db
    .select({
      id: plateBatches.id,
      label: plateBatches.label,
      fileCount: plateBatches.fileCount,
      createdAt: plateBatches.createdAt,
      stored: sql<number>`(select count(*)::int from ${plateBatchFiles} f where f.batch_id = ${plateBatches.id} and f.outcome = 'stored')`,
    })
    .from(plateBatches)
    .where(eq(plateBatches.campaignId, campaignId))
    .orderBy(desc(plateBatches.createdAt))
    .limit(limit);
}

/** Signal of every well of each run, by well index, for the review screen's heatmap thumbnails. */
export async function runSignals(runIds: string[]): Promise<Map<string, (number | null)[]>> {
  const out = new Map<string, (number | null)[]>();
  if (runIds.length === 0) return out;
  const rows = await db
    .select({
      runId: wellReadings.runId,
      i: wellReadings.wellIndex,
      s: wellReadings.signal,
      masked: wellReadings.masked,
    })
    .from(wellReadings)
    .where(inArray(wellReadings.runId, runIds));
  for (const r of rows) {
    let a = out.get(r.runId);
    if (!a) out.set(r.runId, (a = []));
    a[r.i] = r.masked ? null : r.s;
  }
  return out;
}
