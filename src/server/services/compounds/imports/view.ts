import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { compoundImports, users } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { isPreparing } from "./start";
import type { ImportJob, ImportPreview, ImportResult } from "./types";

export async function getImport(id: string): Promise<ImportJob> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw new AppError("not_found", "No such import.");
  const [job] = await db.select().from(compoundImports).where(eq(compoundImports.id, id));
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
      issuesTotal: preview.issues.length,
      warnings: preview.warnings.slice(0, max),
      warningsTotal: preview.warnings.length,
    },
    result: result && {
      mode: result.mode,
      registered: result.registered.length,
      notRegistered: result.notRegistered.length,
      firstRegistryId: result.registered[0]?.registryId ?? null,
      lastRegistryId: result.registered.at(-1)?.registryId ?? null,
    },
  };
}

export async function listImports(limit = 20) {
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
    .orderBy(desc(compoundImports.createdAt))
    .limit(limit);
}
