import "server-only";
import crypto from "node:crypto";
import { and, asc, desc, eq, inArray, isNull, sql } from "drizzle-orm";
import { db, type Tx } from "@/server/db/client";
import { campaigns, compounds, plateMaps, plateRuns, plateWellMasks, users, wellReadings } from "@/server/db/schema";
import { AppError, type ErrorDetail } from "@/server/errors";
import { deleteObject, getObject, putObject } from "@/server/storage/s3";
import { env } from "@/env";
import type { SessionUser } from "@/server/auth/session";
import { audit } from "./audit";
import {
  countRoles,
  formulaInjectionMessage,
  issue,
  plateMapFromWells,
  type PlateIssue,
  type PlateMap,
  type PlateMapWell,
} from "@/lib/plates";
import { MAX_FILE_BYTES, parseReaderExport, type ExportPreview } from "@/lib/plates/reader-export";
import {
  buildReadings,
  computeRunQc,
  type QcInputWell,
  type RunQc,
  type RunReading,
  type SignalDirection,
} from "@/lib/plates/run-qc";
import { canonicalWell, type PlateFormat } from "@/lib/plates/geometry";

type Actor = Pick<SessionUser, "id" | "email">;
type Campaign = typeof campaigns.$inferSelect;

// ---------------------------------------------------------------- errors

/** Plate-library issues as the API's details: line (text files) or field = cell (XLSX), well, message. */
export function issueDetails(issues: readonly PlateIssue[]): ErrorDetail[] {
  return issues.map((i) => ({
    ...(i.line !== undefined ? { line: i.line } : {}),
    ...(i.cell !== undefined ? { field: i.cell } : {}),
    ...(i.well !== undefined ? { well: i.well } : {}),
    message: i.message,
  }));
}

function issuesError(issues: readonly PlateIssue[]): AppError {
  const first = issues[0]!.text;
  const more = issues.length > 1 ? ` (and ${issues.length - 1} more problem${issues.length > 2 ? "s" : ""})` : "";
  return new AppError("bad_request", `${first}${more}`, { details: issueDetails(issues) });
}

function isUniqueViolation(e: unknown): boolean {
  const code = (x: unknown) =>
    typeof x === "object" && x !== null && "code" in x ? (x as { code: unknown }).code : undefined;
  return (
    code(e) === "23505" ||
    (typeof e === "object" && e !== null && "cause" in e && code((e as { cause: unknown }).cause) === "23505")
  );
}

// ---------------------------------------------------------------- compounds

const escapeRe = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
/** Registry IDs as the compound registry writes them: the prefix and six digits (INH-000123). */
export const registryIdRe = new RegExp(`^${escapeRe(env.REGISTRY_PREFIX)}\\d{6}$`);

/**
 * Every compound on a plate map must be a registry ID (format) of a registered compound
 * (the compounds table of the registry). Problems name the well; an ID missing from the registry
 * is reported once per ID with the first well that uses it.
 */
async function compoundIssues(map: PlateMap): Promise<PlateIssue[]> {
  const out: PlateIssue[] = [];
  const firstWell = new Map<string, string>();
  for (const w of map.wells) {
    if (w.compound === undefined) continue;
    if (!registryIdRe.test(w.compound))
      out.push(
        issue(
          { well: w.well },
          `compound "${w.compound.slice(0, 40)}" is not a registry ID (expected e.g. ${env.REGISTRY_PREFIX}000123)`,
        ),
      );
    else if (!firstWell.has(w.compound)) firstWell.set(w.compound, w.well);
  }
  if (firstWell.size > 0) {
    const ids = [...firstWell.keys()];
    const found = new Set(
      (await db.select({ id: compounds.registryId }).from(compounds).where(inArray(compounds.registryId, ids))).map(
        (r) => r.id,
      ),
    );
    for (const id of ids)
      if (!found.has(id))
        out.push(
          issue({ well: firstWell.get(id)! }, `compound ${id} is not in the compound registry; register it first`),
        );
  }
  return out.slice(0, 50);
}

// ---------------------------------------------------------------- plate maps

export type PlateMapInput = {
  name: string;
  map: PlateMap;
  isTemplate?: boolean;
  signalDirection?: SignalDirection;
};

function listedWells(map: PlateMap): PlateMapWell[] {
  return map.wells.filter(
    (w) =>
      w.role !== "empty" ||
      w.compound !== undefined ||
      w.concentrationUm !== undefined ||
      w.substrateUm !== undefined ||
      w.group !== undefined,
  );
}

function checkName(name: string): string {
  const n = name.trim();
  if (n === "") throw new AppError("bad_request", "Give the plate map a name.");
  if (n.length > 120) throw new AppError("bad_request", "A plate map name has at most 120 characters.");
  const inj = formulaInjectionMessage(n);
  if (inj) throw new AppError("bad_request", `Name ${inj}.`);
  return n;
}

/** Save a new plate map (already validated by the plate library); compound IDs are checked here. */
export async function createPlateMap(actor: Actor, campaignId: string, input: PlateMapInput): Promise<{ id: string }> {
  const name = checkName(input.name);
  const bad = await compoundIssues(input.map);
  if (bad.length > 0) throw issuesError(bad);
  const counts = countRoles(input.map);
  try {
    return await db.transaction(async (tx) => {
      const [row] = await tx
        .insert(plateMaps)
        .values({
          campaignId,
          name,
          format: input.map.format,
          isTemplate: input.isTemplate ?? false,
          signalDirection: input.signalDirection ?? "falls",
          wells: listedWells(input.map),
          sampleWells: counts.sample,
          neutralWells: counts.neutral,
          fullWells: counts.full,
          createdBy: actor.id,
          updatedBy: actor.id,
        })
        .returning({ id: plateMaps.id });
      await audit(tx, actor, {
        campaignId,
        action: "plate_map.create",
        entityType: "plate_map",
        entityId: row!.id,
        after: { name, format: input.map.format, ...counts },
      });
      return { id: row!.id };
    });
  } catch (e) {
    if (isUniqueViolation(e))
      throw new AppError("conflict", `A plate map named "${name}" already exists in this campaign.`);
    throw e;
  }
}

/** Change a plate map that no run has used yet (a used map is kept as it was: save a copy instead). */
export async function updatePlateMap(
  actor: Actor,
  campaignId: string,
  mapId: string,
  input: PlateMapInput,
): Promise<{ id: string }> {
  const name = checkName(input.name);
  const bad = await compoundIssues(input.map);
  if (bad.length > 0) throw issuesError(bad);
  const counts = countRoles(input.map);
  try {
    return await db.transaction(async (tx) => {
      const [old] = await tx
        .select()
        .from(plateMaps)
        .where(and(eq(plateMaps.id, mapId), eq(plateMaps.campaignId, campaignId)))
        .for("update");
      if (!old) throw new AppError("not_found", "No such plate map in this campaign.");
      if (old.format !== input.map.format)
        throw new AppError("bad_request", `This plate map is ${old.format}-well; its format cannot change.`);
      const [used] = await tx
        .select({ id: plateRuns.id })
        .from(plateRuns)
        .where(eq(plateRuns.plateMapId, mapId))
        .limit(1);
      if (used)
        throw new AppError(
          "conflict",
          "Plate runs were uploaded against this plate map, so it is kept as it was. Save your changes as a new plate map.",
        );
      await tx
        .update(plateMaps)
        .set({
          name,
          isTemplate: input.isTemplate ?? old.isTemplate,
          signalDirection: input.signalDirection ?? old.signalDirection,
          wells: listedWells(input.map),
          sampleWells: counts.sample,
          neutralWells: counts.neutral,
          fullWells: counts.full,
          updatedBy: actor.id,
          updatedAt: new Date(),
        })
        .where(eq(plateMaps.id, mapId));
      await audit(tx, actor, {
        campaignId,
        action: "plate_map.update",
        entityType: "plate_map",
        entityId: mapId,
        before: { name: old.name, sampleWells: old.sampleWells },
        after: { name, ...counts },
      });
      return { id: mapId };
    });
  } catch (e) {
    if (isUniqueViolation(e))
      throw new AppError("conflict", `A plate map named "${name}" already exists in this campaign.`);
    throw e;
  }
}

export async function listPlateMaps(campaignId: string) {
  return db
    .select({
      id: plateMaps.id,
      name: plateMaps.name,
      format: plateMaps.format,
      isTemplate: plateMaps.isTemplate,
      signalDirection: plateMaps.signalDirection,
      sampleWells: plateMaps.sampleWells,
      neutralWells: plateMaps.neutralWells,
      fullWells: plateMaps.fullWells,
      updatedAt: plateMaps.updatedAt,
      createdBy: users.name,
      runs: sql<number>`(select count(*)::int from ${plateRuns} where ${plateRuns.plateMapId} = ${plateMaps.id})`,
    })
    .from(plateMaps)
    .leftJoin(users, eq(users.id, plateMaps.createdBy))
    .where(eq(plateMaps.campaignId, campaignId))
    .orderBy(desc(plateMaps.isTemplate), asc(plateMaps.name));
}

export async function getPlateMap(campaignId: string, mapId: string) {
  const [row] = await db
    .select()
    .from(plateMaps)
    .where(and(eq(plateMaps.id, mapId), eq(plateMaps.campaignId, campaignId)));
  if (!row) throw new AppError("not_found", "No such plate map in this campaign.");
  return { ...row, map: plateMapFromWells(row.format as PlateFormat, row.wells) };
}

// ---------------------------------------------------------------- runs: upload

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

function cleanFileName(name: string): string {
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

async function loadMapRow(campaignId: string, plateMapId: string) {
  const [row] = await db
    .select()
    .from(plateMaps)
    .where(and(eq(plateMaps.id, plateMapId), eq(plateMaps.campaignId, campaignId)));
  if (!row) throw new AppError("not_found", "No such plate map in this campaign.");
  return row;
}

async function parseAgainstMap(mapRow: typeof plateMaps.$inferSelect, bytes: Uint8Array, fileName: string) {
  const map = plateMapFromWells(mapRow.format as PlateFormat, mapRow.wells);
  const parsed = await parseReaderExport(bytes, fileName, { format: map.format });
  if (!parsed.ok) throw issuesError(parsed.issues);
  const built = buildReadings(map, parsed.export);
  if (!built.ok) throw issuesError(built.issues);
  return { map, exp: parsed.export, built };
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
  const mapRow = await loadMapRow(campaign.id, plateMapId);
  const { exp, built } = await parseAgainstMap(mapRow, bytes, name);
  const { qc } = computeRunQc(qcWells(built), {
    readout: built.readout,
    direction: mapRow.signalDirection,
    minZPrime: campaign.qcMinZPrime,
    maxCvPct: campaign.qcMaxCvPct,
  });
  return {
    preview: exp.preview,
    readout: built.readout,
    wells: exp.wells.size,
    reads: exp.reads,
    qc,
    plateMap: { id: mapRow.id, name: mapRow.name, format: mapRow.format },
  };
}

async function deleteIfUnreferenced(sha256: string): Promise<void> {
  const [ref] = await db.select({ id: plateRuns.id }).from(plateRuns).where(eq(plateRuns.sha256, sha256)).limit(1);
  if (ref) return;
  try {
    await deleteObject(s3KeyFor(sha256));
  } catch (e) {
    console.error("[inhibitrack] could not delete an unreferenced upload", sha256, e);
  }
}

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
 * is written, and the stored object is removed unless another run uses the same bytes.
 */
export async function uploadRun(actor: Actor, campaign: Campaign, input: UploadInput): Promise<RunSummary> {
  const fileName = cleanFileName(input.fileName);
  checkSize(fileName, input.bytes.byteLength);
  const sha256 = crypto.createHash("sha256").update(input.bytes).digest("hex");
  const mapRow = await loadMapRow(campaign.id, input.plateMapId);
  const dup = await duplicateError(campaign.id, sha256, fileName);
  if (dup) throw dup;
  const contentType = (input.contentType || "application/octet-stream").slice(0, 100);
  const key = s3KeyFor(sha256);
  await putObject(key, input.bytes, contentType, sha256);
  try {
    const { exp, built } = await parseAgainstMap(mapRow, input.bytes, fileName);
    const { qc, inhibitionPct } = computeRunQc(qcWells(built), {
      readout: built.readout,
      direction: mapRow.signalDirection,
      minZPrime: campaign.qcMinZPrime,
      maxCvPct: campaign.qcMaxCvPct,
    });
    const id = await db.transaction(async (tx) => {
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
    await deleteIfUnreferenced(sha256);
    if (isUniqueViolation(e))
      throw (
        (await duplicateError(campaign.id, sha256, fileName)) ??
        new AppError("conflict", "This file was uploaded twice at the same time.")
      );
    throw e;
  }
}

// ---------------------------------------------------------------- runs: QC recompute, masks, decisions

/** Recompute QC and % inhibition of a run from its stored readings and open masks (inside tx). */
async function recompute(tx: Tx, runId: string): Promise<RunQc> {
  const [head] = await tx
    .select({
      readout: plateRuns.readout,
      direction: plateMaps.signalDirection,
      minZPrime: campaigns.qcMinZPrime,
      maxCvPct: campaigns.qcMaxCvPct,
    })
    .from(plateRuns)
    .innerJoin(plateMaps, eq(plateMaps.id, plateRuns.plateMapId))
    .innerJoin(campaigns, eq(campaigns.id, plateRuns.campaignId))
    .where(eq(plateRuns.id, runId));
  const rows = await tx
    .select({
      well: wellReadings.well,
      role: wellReadings.role,
      signal: wellReadings.signal,
      isEdge: wellReadings.isEdge,
      masked: wellReadings.masked,
      rateLinear: wellReadings.rateLinear,
    })
    .from(wellReadings)
    .where(eq(wellReadings.runId, runId));
  const { qc, inhibitionPct } = computeRunQc(rows, {
    readout: head!.readout === "kinetic" ? "kinetic" : "endpoint",
    direction: head!.direction,
    minZPrime: head!.minZPrime,
    maxCvPct: head!.maxCvPct,
  });
  const values = JSON.stringify([...inhibitionPct].map(([well, p]) => ({ well, p })));
  await tx.execute(sql`
    update ${wellReadings} as w set inhibition_pct = v.p
    from jsonb_to_recordset(${values}::jsonb) as v(well text, p double precision)
    where w.run_id = ${runId} and w.well = v.well`);
  await tx.update(plateRuns).set({ qc, zPrime: qc.zPrime, qcVerdict: qc.verdict }).where(eq(plateRuns.id, runId));
  return qc;
}

async function lockRun(tx: Tx, campaignId: string, runId: string) {
  const [run] = await tx
    .select()
    .from(plateRuns)
    .where(and(eq(plateRuns.id, runId), eq(plateRuns.campaignId, campaignId)))
    .for("update");
  if (!run) throw new AppError("not_found", "No such plate run in this campaign.");
  return run;
}

function checkReason(reason: string, what: string): string {
  const r = reason.trim();
  if (r.length < 3) throw new AppError("bad_request", `Give a reason for ${what} (at least 3 characters).`);
  if (r.length > 500) throw new AppError("bad_request", "A reason has at most 500 characters.");
  return r;
}

/** Mask one well with a reason (audited); QC and % inhibition are recomputed in the same transaction. */
export async function maskWell(
  actor: Actor,
  campaignId: string,
  runId: string,
  wellName: string,
  reason: string,
): Promise<RunQc> {
  const why = checkReason(reason, "masking a well");
  return db.transaction(async (tx) => {
    const run = await lockRun(tx, campaignId, runId);
    const well = canonicalWell(wellName, run.format as PlateFormat) ?? wellName.trim().toUpperCase();
    const [reading] = await tx
      .select({ masked: wellReadings.masked })
      .from(wellReadings)
      .where(and(eq(wellReadings.runId, runId), eq(wellReadings.well, well)));
    if (!reading) throw new AppError("not_found", `Well ${well.slice(0, 4)} has no reading on this run.`);
    if (reading.masked) throw new AppError("conflict", `Well ${well} is already masked.`);
    await tx.insert(plateWellMasks).values({ runId, well, reason: why, maskedBy: actor.id });
    await tx
      .update(wellReadings)
      .set({ masked: true })
      .where(and(eq(wellReadings.runId, runId), eq(wellReadings.well, well)));
    const qc = await recompute(tx, runId);
    await audit(tx, actor, {
      campaignId,
      action: "plate_run.mask",
      entityType: "plate_run",
      entityId: runId,
      before: { well, zPrime: run.zPrime, verdict: run.qcVerdict },
      after: { well, zPrime: qc.zPrime, verdict: qc.verdict },
      reason: why,
    });
    return qc;
  });
}

/** Unmask a well (the mask row is closed, not deleted); QC and % inhibition are recomputed. */
export async function unmaskWell(
  actor: Actor,
  campaignId: string,
  runId: string,
  wellName: string,
  reason: string,
): Promise<RunQc> {
  const why = checkReason(reason, "unmasking a well");
  return db.transaction(async (tx) => {
    const run = await lockRun(tx, campaignId, runId);
    const well = canonicalWell(wellName, run.format as PlateFormat) ?? wellName.trim().toUpperCase();
    const closed = await tx
      .update(plateWellMasks)
      .set({ unmaskedAt: new Date(), unmaskedBy: actor.id, unmaskReason: why })
      .where(and(eq(plateWellMasks.runId, runId), eq(plateWellMasks.well, well), isNull(plateWellMasks.unmaskedAt)))
      .returning({ id: plateWellMasks.id });
    if (closed.length === 0) throw new AppError("conflict", `Well ${well.slice(0, 4)} is not masked.`);
    await tx
      .update(wellReadings)
      .set({ masked: false })
      .where(and(eq(wellReadings.runId, runId), eq(wellReadings.well, well)));
    const qc = await recompute(tx, runId);
    await audit(tx, actor, {
      campaignId,
      action: "plate_run.unmask",
      entityType: "plate_run",
      entityId: runId,
      before: { well, zPrime: run.zPrime, verdict: run.qcVerdict },
      after: { well, zPrime: qc.zPrime, verdict: qc.verdict },
      reason: why,
    });
    return qc;
  });
}

/**
 * Accept or reject a run with a reason (audited). A run that fails QC cannot be accepted: its
 * numbers must not count until the wells at fault are masked (with reasons) and QC passes.
 */
export async function decideRun(
  actor: Actor,
  campaignId: string,
  runId: string,
  decision: "accepted" | "rejected",
  reason: string,
): Promise<void> {
  const why = checkReason(reason, decision === "accepted" ? "accepting the run" : "rejecting the run");
  await db.transaction(async (tx) => {
    const run = await lockRun(tx, campaignId, runId);
    if (decision === "accepted" && run.qcVerdict !== "pass") {
      throw new AppError(
        "conflict",
        `This run fails QC (${run.qc.reasons[0] ?? "see the QC panel"}), so it cannot be accepted. Mask the wells at fault with a reason, or reject the run.`,
      );
    }
    await tx
      .update(plateRuns)
      .set({ decision, decisionReason: why, decidedBy: actor.id, decidedAt: new Date() })
      .where(eq(plateRuns.id, runId));
    await audit(tx, actor, {
      campaignId,
      action: decision === "accepted" ? "plate_run.accept" : "plate_run.reject",
      entityType: "plate_run",
      entityId: runId,
      before: { decision: run.decision, verdict: run.qcVerdict },
      after: { decision, zPrime: run.zPrime },
      reason: why,
    });
  });
}

// ---------------------------------------------------------------- runs: reading

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
