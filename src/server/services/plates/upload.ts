import "server-only";
import crypto from "node:crypto";
import { and, eq, sql } from "drizzle-orm";
import { db, type Tx } from "@/server/db/client";
import { campaigns, plateMaps, plateRuns, wellReadings } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { putObject } from "@/server/storage/s3";
import { commitWithObject, deleteUnlessReferenced } from "@/server/storage/checksum-lock";
import type { Actor } from "@/server/auth/actor";
import { isUniqueViolation } from "@/server/db/sql-helpers";
import { plateMapFromWells } from "@/lib/plates";
import { MAX_FILE_BYTES, type ExportPreview } from "@/lib/plates/reader-export";
import { parseInWorker } from "@/server/workers/upload-parse-pool";
import { buildReadings, computeRunQc, type QcInputWell, type RunQc, type RunReading } from "@/lib/plates/run-qc";
import { audit } from "../audit";
import { issuesError } from "./errors";
import { loadPlateMapRow } from "./plate-maps";

type Campaign = typeof campaigns.$inferSelect;

export type UploadInput = {
  plateMapId: string;
  fileName: string;
  contentType: string;
  bytes: Uint8Array;
  barcode?: string | null;
};

export type RunSummary = {
  id: string;
  sha256: string;
  wells: number;
  reads: number;
  qc: {
    zPrime: number | null;
    signalToBackground: number | null;
    signalWindow: number | null;
    cvNeutralPct: number | null;
    cvFullPct: number | null;
    verdict: "pass" | "fail";
  };
};

const MIB = 1024 * 1024;
export const UPLOAD_LIMIT_BYTES = MAX_FILE_BYTES;

function checkSize(fileName: string, size: number): void {
  if (size > MAX_FILE_BYTES)
    throw new AppError(
      "too_large",
      `${fileName}: file is ${(size / MIB).toFixed(1)} MB; the limit is ${MAX_FILE_BYTES / MIB} MB`,
    );
}

export function cleanFileName(name: string): string {
  // Keep the name people recognise, without path parts or control characters.
  const base = name.split(/[\\/]/).pop() ?? "export";
  const cleaned = [...base]
    .filter((ch) => ch.charCodeAt(0) >= 32 && ch.charCodeAt(0) !== 127)
    .join("")
    .trim()
    .slice(0, 200);
  return cleaned || "export";
}

export const s3KeyFor = (sha256: string) => `plate-runs/sha256/${sha256}`;

/** Parse with the plate map's format, check against the map, then QC and % inhibition (nothing stored). */
async function readAgainstMap(
  campaign: Campaign,
  mapRow: typeof plateMaps.$inferSelect,
  bytes: Uint8Array,
  fileName: string,
) {
  const map = plateMapFromWells(mapRow.format, mapRow.wells);
  // Off the request thread, with memory and time limits (a workbook may be a zip bomb).
  const parsed = await parseInWorker(
    { kind: "plate-export", bytes, fileName, options: { format: map.format } },
    fileName,
  );
  if (!parsed.ok) throw issuesError(parsed.issues);
  const built = buildReadings(map, parsed.export);
  if (!built.ok) throw issuesError(built.issues);
  const { qc, inhibitionPct } = computeRunQc(qcWells(built), {
    readout: built.readout,
    direction: mapRow.signalDirection,
    minZPrime: campaign.qcMinZPrime,
    maxCvPct: campaign.qcMaxCvPct,
  });
  return { exp: parsed.export, built, qc, inhibitionPct };
}

function qcWells(readings: ReturnType<typeof buildReadings> & { ok: true }): QcInputWell[] {
  return readings.readings.map((r) => ({
    well: r.well,
    role: r.role,
    signal: r.signal,
    isEdge: r.isEdge,
    masked: false,
    rateLinear: r.rate ? !r.rate.curved : null,
  }));
}

export type RunPreview = {
  preview: ExportPreview;
  readout: "endpoint" | "kinetic";
  wells: number;
  reads: number;
  qc: RunQc;
  plateMap: { id: string; name: string; format: number };
};

/** Parse only, nothing stored: what was detected, checked against the plate map, with provisional QC. */
export async function previewRun(
  campaign: Campaign,
  plateMapId: string,
  fileName: string,
  bytes: Uint8Array,
): Promise<RunPreview> {
  const name = cleanFileName(fileName);
  checkSize(name, bytes.byteLength);
  const mapRow = await loadPlateMapRow(campaign.id, plateMapId);
  const { exp, built, qc } = await readAgainstMap(campaign, mapRow, bytes, name);
  return {
    preview: exp.preview,
    readout: built.readout,
    wells: exp.wells.size,
    reads: exp.reads,
    qc,
    plateMap: { id: mapRow.id, name: mapRow.name, format: mapRow.format },
  };
}

/** Whether a committed run (in any campaign) uses the object of these bytes. */
const runUses = (sha256: string) => async (tx: Tx) =>
  (await tx.select({ id: plateRuns.id }).from(plateRuns).where(eq(plateRuns.sha256, sha256)).limit(1)).length > 0;

async function duplicateError(campaignId: string, sha256: string, fileName: string): Promise<AppError | null> {
  const [dup] = await db
    .select({ id: plateRuns.id, fileName: plateRuns.fileName, uploadedAt: plateRuns.uploadedAt })
    .from(plateRuns)
    .where(and(eq(plateRuns.campaignId, campaignId), eq(plateRuns.sha256, sha256)));
  if (!dup) return null;
  return new AppError(
    "conflict",
    `${fileName}: this file (SHA-256 ${sha256.slice(0, 12)}…) was already uploaded as "${dup.fileName}" on ${dup.uploadedAt.toISOString().slice(0, 10)}.`,
    {
      extra: { runId: dup.id },
    },
  );
}

/**
 * All readings of a run in one INSERT … SELECT from a JSON array (one parameter). Measured with
 * bench/plates-server.ts: drizzle's multi-row `values()` with ~32,000 bound parameters took about
 * 180 ms for 1536 wells, most of the 300 ms budget; this form takes a small fraction of that.
 */
async function insertReadings(
  tx: Tx,
  runId: string,
  readings: RunReading[],
  inhibitionPct: Map<string, number | null>,
): Promise<void> {
  const rows = readings.map((r) => ({
    well: r.well,
    well_index: r.wellIndex,
    role: r.role,
    compound_id: r.compoundId,
    concentration_um: r.concentrationUm,
    substrate_um: r.substrateUm,
    replicate_group: r.replicateGroup,
    is_edge: r.isEdge,
    value: r.value,
    rate_signal_per_s: r.rate?.slope ?? null,
    rate_r_squared: r.rate?.rSquared ?? null,
    rate_linear: r.rate ? !r.rate.curved : null,
    rate_progress: r.rate?.progress ?? null,
    rate_window_start_s: r.rate?.startTime ?? null,
    rate_window_end_s: r.rate?.endTime ?? null,
    series: r.series,
    signal: r.signal,
    inhibition_pct: inhibitionPct.get(r.well) ?? null,
  }));
  await tx.execute(sql`
    insert into ${wellReadings} (run_id, well, well_index, role, compound_id, concentration_um, substrate_um, replicate_group, is_edge, value,
      rate_signal_per_s, rate_r_squared, rate_linear, rate_progress, rate_window_start_s, rate_window_end_s, series, signal, inhibition_pct)
    select ${runId}::uuid, well, well_index, role, compound_id, concentration_um, substrate_um, replicate_group, is_edge, value,
      rate_signal_per_s, rate_r_squared, rate_linear, rate_progress, rate_window_start_s, rate_window_end_s, series, signal, inhibition_pct
    from jsonb_to_recordset(${JSON.stringify(rows)}::jsonb) as r(well text, well_index int, role well_role, compound_id text, concentration_um float8,
      substrate_um float8, replicate_group text, is_edge boolean, value float8, rate_signal_per_s float8, rate_r_squared float8, rate_linear boolean,
      rate_progress text, rate_window_start_s float8, rate_window_end_s float8, series jsonb, signal float8, inhibition_pct float8)`);
}

/**
 * Upload a reader export: size cap → SHA-256 → duplicate check → stored in the object store →
 * parsed with the plate map's format → checked against the map → initial rates (kinetic) →
 * QC and % inhibition → one transaction writing the run and its readings. On any error nothing
 * is written, and the stored object is removed unless another run uses the same bytes. Runs of
 * the same bytes in other campaigns share the object: the commit and the removal hold the
 * checksum's lock (src/server/storage/checksum-lock.ts), so a failing upload never removes the
 * raw file of a good one.
 */
export async function uploadRun(actor: Actor, campaign: Campaign, input: UploadInput): Promise<RunSummary> {
  const fileName = cleanFileName(input.fileName);
  checkSize(fileName, input.bytes.byteLength);
  const sha256 = crypto.createHash("sha256").update(input.bytes).digest("hex");
  const mapRow = await loadPlateMapRow(campaign.id, input.plateMapId);
  const dup = await duplicateError(campaign.id, sha256, fileName);
  if (dup) throw dup;
  const contentType = (input.contentType || "application/octet-stream").slice(0, 100);
  const key = s3KeyFor(sha256);
  await putObject(key, input.bytes, contentType, sha256);
  try {
    const { exp, built, qc, inhibitionPct } = await readAgainstMap(campaign, mapRow, input.bytes, fileName);
    const id = await commitWithObject({ key, bytes: input.bytes, contentType, sha256 }, async (tx) => {
      const [run] = await tx
        .insert(plateRuns)
        .values({
          campaignId: campaign.id,
          plateMapId: mapRow.id,
          barcode: input.barcode?.trim() || null,
          fileName,
          contentType,
          sizeBytes: input.bytes.byteLength,
          sha256,
          s3Key: key,
          shape: exp.shape,
          format: exp.format,
          reads: exp.reads,
          wellCount: exp.wells.size,
          readout: built.readout,
          qc,
          zPrime: qc.zPrime,
          qcVerdict: qc.verdict,
          uploadedBy: actor.id,
        })
        .returning({ id: plateRuns.id });
      const runId = run!.id;
      await insertReadings(tx, runId, built.readings, inhibitionPct);
      await audit(tx, actor, {
        campaignId: campaign.id,
        action: "plate_run.upload",
        entityType: "plate_run",
        entityId: runId,
        after: { fileName, sha256, plateMapId: mapRow.id, zPrime: qc.zPrime, verdict: qc.verdict },
      });
      return runId;
    });
    return {
      id,
      sha256,
      wells: exp.wells.size,
      reads: exp.reads,
      qc: {
        zPrime: qc.zPrime,
        signalToBackground: qc.signalToBackground,
        signalWindow: qc.signalWindow,
        cvNeutralPct: qc.cvNeutralPct,
        cvFullPct: qc.cvFullPct,
        verdict: qc.verdict,
      },
    };
  } catch (e) {
    await deleteUnlessReferenced(key, sha256, runUses(sha256));
    if (isUniqueViolation(e))
      throw (
        (await duplicateError(campaign.id, sha256, fileName)) ??
        new AppError("conflict", "This file was uploaded twice at the same time.")
      );
    throw e;
  }
}
