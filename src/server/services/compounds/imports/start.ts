import "server-only";
import crypto from "node:crypto";
import { eq } from "drizzle-orm";
import { compoundImports } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { putObject } from "@/server/storage/s3";
import { commitWithObject, deleteUnlessReferenced } from "@/server/storage/checksum-lock";
import { checkImportFile } from "@/server/workers/upload-refusal";
import type { Actor } from "@/server/auth/actor";
import { MAX_IMPORT_BYTES, type ImportFormat } from "@/lib/chem/import-types";
import { prepareJob } from "./prepare";
import type { ImportJob } from "./types";

const FORMATS: Record<string, ImportFormat> = {
  csv: "csv",
  tsv: "csv",
  txt: "csv",
  xlsx: "xlsx",
  sdf: "sdf",
  sd: "sdf",
};

export function importFormatOf(fileName: string): ImportFormat {
  const ext = /\.([A-Za-z0-9]+)$/.exec(fileName)?.[1]?.toLowerCase() ?? "";
  const f = FORMATS[ext];
  if (!f)
    throw new AppError(
      "bad_request",
      `${fileName.slice(0, 80)}: use a .csv, .xlsx or .sdf file (this one ends in "${ext ? `.${ext}` : "no extension"}").`,
      { details: [{ field: "file", message: "Unsupported file type." }] },
    );
  return f;
}

export const importS3Key = (sha256: string) => `compound-imports/sha256/${sha256}`;

/** Jobs running in this process, so tests and the benchmark can wait for one. */
const running = new Map<string, Promise<void>>();

/** True while this process is still preparing the job (so silence in its row is not a stopped job). */
export const isPreparing = (id: string): boolean => running.has(id);

/**
 * Step 1 of a bulk import: store the file in the object store with its SHA-256 (before anything
 * reads it), create the job row and start preparing it in the background. Returns at once; the
 * page polls the job for progress.
 */
export async function startImport(
  actor: Actor,
  input: { fileName: string; contentType?: string; bytes: Uint8Array },
): Promise<{ job: ImportJob; done: Promise<void> }> {
  const fileName = input.fileName.replace(/[\r\n\t]/g, " ").slice(0, 200) || "upload";
  if (input.bytes.byteLength === 0)
    throw new AppError("bad_request", `${fileName}: the file is empty.`, {
      details: [{ field: "file", message: "The file is empty." }],
    });
  if (input.bytes.byteLength > MAX_IMPORT_BYTES)
    throw new AppError(
      "too_large",
      `${fileName} is ${(input.bytes.byteLength / 1024 / 1024).toFixed(1)} MB; the limit is ${MAX_IMPORT_BYTES / 1024 / 1024} MB.`,
    );
  const format = importFormatOf(fileName);
  const sha256 = crypto.createHash("sha256").update(input.bytes).digest("hex");
  const s3Key = importS3Key(sha256);
  const contentType = input.contentType || "application/octet-stream";
  await putObject(s3Key, input.bytes, contentType, sha256);
  // Parsed once, off the request thread with the upload limits: a tripped limit is refused (400)
  // and its stored copy goes unless another import uses the same bytes; a file that cannot be
  // imported at all becomes a failed job with its (capped) sentence, without a preparation.
  const check = await checkImportFile(fileName, format, input.bytes);
  if (check.refused) {
    await deleteUnlessReferenced(
      s3Key,
      sha256,
      async (tx) =>
        (
          await tx
            .select({ id: compoundImports.id })
            .from(compoundImports)
            .where(eq(compoundImports.s3Key, s3Key))
            .limit(1)
        ).length > 0,
    );
    throw check.refused;
  }
  const [job] = await commitWithObject({ key: s3Key, bytes: input.bytes, contentType, sha256 }, (tx) =>
    tx
      .insert(compoundImports)
      .values({
        fileName,
        sha256,
        s3Key,
        sizeBytes: input.bytes.byteLength,
        format,
        createdBy: actor.id,
        ...(check.error ? { status: "failed" as const, error: check.error } : {}),
      })
      .returning(),
  );
  if (check.error || !check.parsed) return { job: job!, done: Promise.resolve() };
  // The worker's parse is the one parse: the preparation takes its records as they are.
  const done = prepareJob(job!.id, { parsed: check.parsed, parseMs: check.parseMs ?? 0 }).finally(() =>
    running.delete(job!.id),
  );
  running.set(job!.id, done);
  return { job: job!, done };
}

/** Resolves when the job's background preparation in this process has finished (or at once). */
export async function waitForImport(id: string): Promise<void> {
  await running.get(id);
}
