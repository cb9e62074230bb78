import "server-only";
import { and, desc, eq, type SQL } from "drizzle-orm";
import { db } from "@/server/db/client";
import { compoundImports, users } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { SessionUser } from "@/server/auth/session";
import { isPreparing } from "./start";
import type { ImportJob, ImportPreview, ImportResult } from "./types";

/** Who reads import jobs: the uploader, or an administrator. */
export type ImportReader = Pick<SessionUser, "id"> & { globalRole?: SessionUser["globalRole"] };

/**
 * An import job's preview holds unregistered structures and names, and its commit registers them:
 * only the person who uploaded it and administrators may read or commit it. For anyone else the
 * job does not exist (404), so its existence is not confirmed.
 */
export function importOwnedBy(reader: ImportReader): SQL | undefined {
  return reader.globalRole === "admin" ? undefined : eq(compoundImports.createdBy, reader.id);
}

export async function getImport(reader: ImportReader, id: string): Promise<ImportJob> {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(id))
    throw new AppError("not_found", "No such import.");
  const [job] = await db
    .select()
    .from(compoundImports)
    .where(and(eq(compoundImports.id, id), importOwnedBy(reader)));
  if (!job) throw new AppError("not_found", "No such import.");
  // Preparation runs in the server process: after a restart an unfinished job would wait forever.
  if (
    (job.status === "stored" || job.status === "preparing") &&
    !isPreparing(id) &&
    Date.now() - job.updatedAt.getTime() > STALE_MS
  ) {
    const [failed] = await db
      .update(compoundImports)
      .set({
        status: "failed",
        error: `Checking ${job.fileName} was interrupted (the server restarted). Upload the file again; nothing was registered.`,
        updatedAt: new Date(),
      })
      .where(and(eq(compoundImports.id, id), eq(compoundImports.updatedAt, job.updatedAt)))
      .returning();
    return failed ?? job;
  }
  return job;
}

/** A job in preparation writes progress at least every few seconds; this much silence means it stopped. */
const STALE_MS = 120_000;

/** The job as the import page and `GET /api/compound-imports/{id}` show it. */
export function importView(job: ImportJob, opts: { maxIssues?: number } = {}) {
  const preview = job.preview as ImportPreview | null;
  const result = job.result as ImportResult | null;
  const max = opts.maxIssues ?? 1000;
  return {
    id: job.id,
    fileName: job.fileName,
    sha256: job.sha256,
    sizeBytes: job.sizeBytes,
    format: job.format,
    status: job.status,
    progress: { done: job.progressDone, total: job.progressTotal },
    error: job.error,
    mode: job.mode,
    createdAt: job.createdAt.toISOString(),
    committedAt: job.committedAt?.toISOString() ?? null,
    preview: preview && {
      ...preview,
      issues: preview.issues.slice(0, max),
      issuesShown: Math.min(max, preview.issues.length),
      issuesTotal: preview.issues.length + (preview.issuesNotStored ?? 0),
      issuesNotStored: preview.issuesNotStored ?? 0,
      warnings: preview.warnings.slice(0, max),
      warningsTotal: preview.warnings.length + (preview.warningsNotStored ?? 0),
      warningsNotStored: preview.warningsNotStored ?? 0,
    },
    result: result && {
      mode: result.mode,
      registered: result.registered.length,
      notRegistered: result.notRegistered.length,
      notListed: result.notListed ?? 0,
      firstRegistryId: result.registered[0]?.registryId ?? null,
      lastRegistryId: result.registered.at(-1)?.registryId ?? null,
    },
  };
}

/** The reader's recent imports (an administrator's list holds everyone's). */
export async function listImports(reader: ImportReader, limit = 20) {
  return db
    .select({
      id: compoundImports.id,
      fileName: compoundImports.fileName,
      status: compoundImports.status,
      createdAt: compoundImports.createdAt,
      by: users.name,
      progressTotal: compoundImports.progressTotal,
    })
    .from(compoundImports)
    .leftJoin(users, eq(users.id, compoundImports.createdBy))
    .where(importOwnedBy(reader))
    .orderBy(desc(compoundImports.createdAt))
    .limit(limit);
}
