import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses, campaigns, compoundResults, experiments, memberships } from "@/server/db/schema";
import type { SessionUser } from "@/server/auth/session";

/**
 * The current analysis results for one compound in every campaign the user may see (members see
 * their campaigns; administrators all). Concentrations in µM. Read-only: results are written by
 * the analyses service.
 */
export async function resultsForCompound(user: Pick<SessionUser, "id" | "globalRole">, registryId: string) {
  const visible =
    user.globalRole === "admin"
      ? sql`true`
      : sql`exists (select 1 from ${memberships} m where m.campaign_id = ${compoundResults.campaignId} and m.user_id = ${user.id})`;
  return db
    .select({
      campaignId: campaigns.id,
      campaign: campaigns.name,
      experimentId: experiments.id,
      experiment: experiments.name,
      kind: compoundResults.kind,
      nPoints: compoundResults.nPoints,
      pctInhibition: compoundResults.pctInhibition,
      hit: compoundResults.hit,
      ic50Um: compoundResults.ic50Um,
      ic50Qualifier: compoundResults.ic50Qualifier,
      hill: compoundResults.hill,
      mechanism: compoundResults.mechanism,
      mechanismLabel: compoundResults.mechanismLabel,
      kiUm: compoundResults.kiUm,
      alpha: compoundResults.alpha,
      flags: compoundResults.flags,
      finishedAt: analyses.finishedAt,
    })
    .from(compoundResults)
    .innerJoin(analyses, and(eq(analyses.id, compoundResults.analysisId), eq(analyses.isCurrent, true)))
    .innerJoin(campaigns, eq(campaigns.id, compoundResults.campaignId))
    .innerJoin(experiments, eq(experiments.id, compoundResults.experimentId))
    .where(and(eq(compoundResults.compoundId, registryId), visible))
    .orderBy(asc(campaigns.name), asc(experiments.name));
}
export type CompoundResultRow = Awaited<ReturnType<typeof resultsForCompound>>[number];
