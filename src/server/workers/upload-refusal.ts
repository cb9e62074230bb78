import "server-only";
import { AppError } from "@/server/errors";
import { MAX_IMPORT_RECORDS, type ImportFormat, type ImportParseResult } from "@/lib/chem/import-types";
import { parseInWorker } from "./upload-parse-pool";

/** Longest message stored or returned for a refused upload; the rest is cut (chosen here). */
export const MAX_MESSAGE_CHARS = 2048;

/** A message cut to `max` characters with a visible mark, so a hostile header cannot become a 60 MB error. */
export function capMessage(text: string, max = MAX_MESSAGE_CHARS): string {
  return text.length <= max ? text : `${text.slice(0, max)}… (truncated)`;
}

/**
 * Parses a compound-import file in the upload-parse pool before its job is created. `refused`:
 * a limit tripped (time, memory, queue), the upload is refused with 4xx. `error`: the file
 * cannot be imported at all (not a workbook, a zip bomb, no structure column, too many records,
 * NUL characters), the job is stored as failed with this sentence, capped. Otherwise `parsed` is
 * the parse itself, handed to the job's preparation so the file is parsed once.
 */
export async function checkImportFile(
  fileName: string,
  format: ImportFormat,
  bytes: Uint8Array,
): Promise<{ refused?: AppError; error?: string; parsed?: ImportParseResult; parseMs?: number }> {
  let errors: string[];
  let parsed: ImportParseResult;
  const t0 = performance.now();
  try {
    parsed = await parseInWorker({ kind: "compound-import", bytes, format }, fileName);
    errors = [...parsed.fileErrors];
    if (errors.length === 0 && parsed.totalRecords > MAX_IMPORT_RECORDS)
      errors.push(
        `The file has ${parsed.totalRecords} records; the limit is ${MAX_IMPORT_RECORDS.toLocaleString("en")}.`,
      );
  } catch (e) {
    if (e instanceof AppError && e.status < 500) return { refused: e };
    throw e;
  }
  return errors.length === 0
    ? { parsed, parseMs: performance.now() - t0 }
    : { error: capMessage(`${fileName}: ${errors.join(" ")}`) };
}
