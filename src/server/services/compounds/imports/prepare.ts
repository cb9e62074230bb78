import "server-only";
import crypto from "node:crypto";
import { eq, inArray } from "drizzle-orm";
import { db } from "@/server/db/client";
import { compoundImportRows, compoundImports, compounds } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { getObject } from "@/server/storage/s3";
import { capMessage } from "@/server/workers/upload-refusal";
import { parseInWorker } from "@/server/workers/upload-parse-pool";
import { MAX_IMPORT_RECORDS, type ImportIssue, type ImportParseResult } from "@/lib/chem/import-types";
import type { PreparedRecord } from "@/lib/chem/import-prepare";
import { prepareAll } from "../prepare-pool";
import type { PreparedCompound } from "../write";
import { capIgnoredFields, capIssues } from "./caps";
import type { ImportPreview } from "./types";

function toPrepared(p: PreparedRecord): PreparedCompound {
  const hasBatch = !!p.batch && Object.values(p.batch).some((v) => v !== undefined);
  const hasStock = !!p.stock && Object.values(p.stock).some((v) => v !== undefined);
  return {
    properties: p.properties,
    fingerprintBits: p.fingerprintBits,
    molfile: p.molfile ?? null,
    name: p.name ?? null,
    aliases: p.aliases ?? [],
    batches: hasBatch || hasStock ? [p.batch ?? {}] : [],
    stocks: hasStock ? [{ ...p.stock!, batchIndex: 0 }] : [],
  };
}

/**
 * Step 2, in the background: take the file's records (the parse made in the upload-parse pool
 * when the file was stored; without one, the stored file is read back, its SHA-256 checked and
 * parsed in the pool), prepare every record (progress written to the job row), check the
 * structures against the registry and keep the prepared records beside the job. Problems are
 * stored capped (caps.ts). Any failure marks the job failed with a sentence.
 */
export async function prepareJob(id: string, given?: { parsed: ImportParseResult; parseMs: number }): Promise<void> {
  const t0 = performance.now();
  try {
    const [job] = await db
      .update(compoundImports)
      .set({ status: "preparing", updatedAt: new Date() })
      .where(eq(compoundImports.id, id))
      .returning();
    let parsed: ImportParseResult;
    let parseMs: number;
    if (given) ({ parsed, parseMs } = given);
    else {
      const bytes = await getObject(job!.s3Key);
      const check = crypto.createHash("sha256").update(bytes).digest("hex");
      if (check !== job!.sha256) throw new AppError("internal", "The stored file does not match its checksum.");
      const tParse = performance.now();
      parsed = await parseInWorker({ kind: "compound-import", bytes, format: job!.format }, job!.fileName);
      parseMs = performance.now() - tParse;
    }
    if (parsed.fileErrors.length > 0) {
      await db
        .update(compoundImports)
        .set({
          status: "failed",
          error: capMessage(`${job!.fileName}: ${parsed.fileErrors.join(" ")}`),
          updatedAt: new Date(),
        })
        .where(eq(compoundImports.id, id));
      return;
    }
    if (parsed.totalRecords > MAX_IMPORT_RECORDS) {
      await db
        .update(compoundImports)
        .set({
          status: "failed",
          error: `${job!.fileName} has ${parsed.totalRecords} records; the limit is ${MAX_IMPORT_RECORDS.toLocaleString("en")}.`,
          updatedAt: new Date(),
        })
        .where(eq(compoundImports.id, id));
      return;
    }
    // Progress counts every record of the file; those refused by the form checks are already done.
    const formRejected = parsed.totalRecords - parsed.records.length;
    await db
      .update(compoundImports)
      .set({ progressTotal: parsed.totalRecords, progressDone: formRejected })
      .where(eq(compoundImports.id, id));
    let lastWrite = 0;
    const tStructures = performance.now();
    const prep = await prepareAll(parsed.records, async (done, total) => {
      if (done === total || performance.now() - lastWrite > 400) {
        lastWrite = performance.now();
        await db
          .update(compoundImports)
          .set({ progressDone: formRejected + done, updatedAt: new Date() })
          .where(eq(compoundImports.id, id));
      }
    });
    const structuresMs = performance.now() - tStructures;
    const tCheck = performance.now();
    const issues: ImportIssue[] = [...parsed.issues, ...prep.issues];
    // Structures already in the registry (same key), or another stereo form of one (the form asks for a reason).
    const keys = prep.prepared.map((p) => p.properties.structureKey);
    const flats = prep.prepared.map((p) => p.properties.flatKey);
    const existing = new Map<string, string>();
    const existingFlat = new Map<string, string>();
    for (let i = 0; i < keys.length; i += 2000) {
      const rows = await db
        .select({ key: compounds.structureKey, flat: compounds.flatKey, registryId: compounds.registryId })
        .from(compounds)
        .where(inArray(compounds.flatKey, flats.slice(i, i + 2000)));
      for (const r of rows) {
        existing.set(r.key, r.registryId);
        if (!existingFlat.has(r.flat)) existingFlat.set(r.flat, r.registryId);
      }
    }
    const good: PreparedRecord[] = [];
    for (const p of prep.prepared) {
      const field = p.smiles !== undefined ? "smiles" : "molfile";
      const dup = existing.get(p.properties.structureKey);
      const sib = existingFlat.get(p.properties.flatKey);
      if (dup)
        issues.push({
          record: p.recordNo,
          line: p.line,
          field,
          message: `Already registered as ${dup}; add a batch to ${dup} instead.`,
        });
      else if (sib)
        issues.push({
          record: p.recordNo,
          line: p.line,
          field,
          message: `Another stereo form is registered as ${sib}; register this one with the form and a reason.`,
        });
      else good.push(p);
    }
    issues.sort((a, b) => a.record - b.record || a.line - b.line);
    const invalidRecords = [...new Set(issues.map((i) => i.record))].sort((a, b) => a - b);
    const checkMs = performance.now() - tCheck;
    const storedIssues = capIssues(issues);
    const storedWarnings = capIssues(prep.warnings);
    const preview: ImportPreview = {
      format: parsed.format,
      totalRecords: parsed.totalRecords,
      valid: good.length,
      invalid: invalidRecords.length,
      invalidRecords,
      issues: storedIssues.kept,
      issuesNotStored: storedIssues.notStored,
      warnings: storedWarnings.kept,
      warningsNotStored: storedWarnings.notStored,
      ignoredFields: capIgnoredFields(parsed.ignoredFields),
      sample: good.slice(0, 50).map((p) => ({
        record: p.recordNo,
        line: p.line,
        name: p.name ?? null,
        smiles: p.properties.canonicalSmiles,
        formula: p.properties.formula,
        mw: p.properties.mwGPerMol,
      })),
      threads: prep.threads,
      prepareMs: 0,
    };
    const tStore = performance.now();
    await db.transaction(async (tx) => {
      await tx.delete(compoundImportRows).where(eq(compoundImportRows.importId, id));
      for (let i = 0; i < good.length; i += 1000) {
        await tx
          .insert(compoundImportRows)
          .values(
            good
              .slice(i, i + 1000)
              .map((p) => ({ importId: id, recordNo: p.recordNo, line: p.line, ok: true, data: toPrepared(p) })),
          );
      }
      preview.prepareMs = Math.round(performance.now() - t0);
      preview.timings = {
        parseMs: Math.round(parseMs),
        structuresMs: Math.round(structuresMs),
        checkMs: Math.round(checkMs),
        storeMs: Math.round(performance.now() - tStore),
      };
      await tx
        .update(compoundImports)
        .set({ status: "ready", preview, progressDone: parsed.totalRecords, updatedAt: new Date() })
        .where(eq(compoundImports.id, id));
    });
  } catch (e) {
    const message =
      e instanceof AppError && e.code !== "internal"
        ? capMessage(e.message)
        : "Preparing the file failed on our side; the error has been logged. Try again, or split the file.";
    console.error("[inhibitrack] compound import preparation failed", id, e);
    await db
      .update(compoundImports)
      .set({ status: "failed", error: message, updatedAt: new Date() })
      .where(eq(compoundImports.id, id))
      .catch(() => undefined);
  }
}
