import "server-only";
import { and, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { plateRuns } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { canonicalWell, type PlateFormat } from "@/lib/plates";

/** A run's format, QC verdict and decision (404 outside the campaign), without its readings. */
export async function runHead(campaignId: string, runId: string) {
  const [run] = await db
    .select({
      format: plateRuns.format,
      verdict: plateRuns.qcVerdict,
      zPrime: plateRuns.zPrime,
      decision: plateRuns.decision,
      reason: plateRuns.decisionReason,
    })
    .from(plateRuns)
    .where(and(eq(plateRuns.id, runId), eq(plateRuns.campaignId, campaignId)));
  if (!run) throw new AppError("not_found", "No such plate run in this campaign.");
  return run;
}

/**
 * Well names in the run's format ("b03" → "B3"), or a 400 naming every name that is not a well
 * of that plate (e.g. "Q30" on a 96-well plate).
 */
export function checkWellNames(names: readonly string[], format: PlateFormat): string[] {
  const bad: string[] = [];
  const out = names.map((n) => {
    const w = canonicalWell(n, format);
    if (w === undefined) bad.push(n.slice(0, 8));
    return w ?? n;
  });
  if (bad.length > 0)
    throw new AppError(
      "bad_request",
      `Not ${bad.length === 1 ? "a well" : "wells"} of a ${format}-well plate: ${bad.slice(0, 10).join(", ")}${bad.length > 10 ? ` (and ${bad.length - 10} more)` : ""}.`,
    );
  return out;
}
