import "server-only";
import { AppError } from "@/server/errors";
import { parseInWorker } from "@/server/workers/upload-parse-pool";
import type { PlateMap, PlateMapParseResult } from "@/lib/plates";
import type { PlateFormat } from "@/lib/plates/geometry";
import { issueDetails } from "./errors";

/**
 * A plate-map CSV read in the upload-parse pool, not the server's thread: a hostile 2 MB file
 * (a header line of millions of cells, deep quoting) costs a worker's time, bounded by the pool's
 * time and memory limits, while other requests go on. Every problem keeps its line and well.
 */
export async function readPlateMapCsv(bytes: Uint8Array, format: PlateFormat, fileName: string): Promise<PlateMap> {
  const parsed = await parseInWorker({ kind: "plate-map-csv", bytes, format, fileName }, fileName);
  if (!parsed.ok) {
    const more = parsed.issues.length > 1 ? ` (and ${parsed.issues.length - 1} more)` : "";
    throw new AppError("bad_request", `${parsed.issues[0]!.text}${more}`, { details: issueDetails(parsed.issues) });
  }
  return parsed.map;
}

/** The editor's plate-map JSON (up to 900 kB), decoded and checked in the upload-parse pool. */
export function readPlateMapJson(json: string): Promise<PlateMapParseResult> {
  return parseInWorker({ kind: "plate-map-json", json }, "The plate map");
}
