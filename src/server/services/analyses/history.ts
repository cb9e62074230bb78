import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses } from "@/server/db/schema";
import { AppError } from "@/server/errors";

export type Analysis = typeof analyses.$inferSelect;

/** One analysis of the campaign (status, progress, provenance); not found outside it. */
export async function getAnalysis(campaignId: string, analysisId: string): Promise<Analysis> {
  if (!/^[0-9a-f-]{36}$/i.test(analysisId)) throw new AppError("not_found", "No such analysis.");
  const a = await db.query.analyses.findFirst({
    where: and(eq(analyses.id, analysisId), eq(analyses.campaignId, campaignId)),
  });
  if (!a) throw new AppError("not_found", "No such analysis.");
  return a;
}

/** The experiment's analyses, newest request first: the provenance table of the experiment page. */
export async function analysisHistory(experimentId: string, limit = 10): Promise<Analysis[]> {
  return db
    .select()
    .from(analyses)
    .where(eq(analyses.experimentId, experimentId))
    .orderBy(desc(analyses.requestedAt))
    .limit(limit);
}

/** The JSON of GET …/analyses/{analysisId}: status, progress (0–1) and provenance. */
export function analysisJson(a: Analysis) {
  return {
    id: a.id,
    status: a.status,
    progress: a.progress,
    current: a.isCurrent,
    compounds: a.compounds,
    error: a.status === "failed" ? a.error : null,
    engineVersion: a.engineVersion,
    inputHash: a.inputHash,
    inputs: { runs: a.inputs.runs, masks: a.inputs.masks, settings: a.inputs.settings },
    requestedAt: a.requestedAt.toISOString(),
    startedAt: a.startedAt?.toISOString() ?? null,
    finishedAt: a.finishedAt?.toISOString() ?? null,
  };
}
export type AnalysisJson = ReturnType<typeof analysisJson>;
