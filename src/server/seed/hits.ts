import "server-only";
import { asc, eq, sql } from "drizzle-orm";
import type { Db } from "@/server/db/client";
import { hitRows } from "@/server/db/schema";
import { addComment, setTriageStatus } from "@/server/services/hits";

/**
 * A few INVENTED triage decisions and comments on the demo campaign's ranked hits, so the grid,
 * the compound panel and the overview open with history. The people are the demo accounts; the
 * reasons are made up for the demo.
 */
export async function seedHits(
  db: Db,
  ctx: { mainCampaignId: string; userIds: Record<string, string> },
): Promise<{ decisions: number; comments: number }> {
  const person = (email: string) => ({ id: ctx.userIds[email]!, email });
  const lead = person("lead@example.org");
  const ranked = await db
    .select({ id: hitRows.compoundId, flagged: hitRows.flagged, ki: hitRows.kiUm, ic50: hitRows.ic50Um })
    .from(hitRows)
    .where(eq(hitRows.campaignId, ctx.mainCampaignId))
    .orderBy(
      asc(hitRows.flagged),
      sql`${hitRows.kiUm} asc nulls last`,
      sql`${hitRows.ic50Um} asc nulls last`,
      sql`${hitRows.pctInhibition} desc nulls last`,
      asc(hitRows.compoundId),
    );
  if (ranked.length === 0) return { decisions: 0, comments: 0 };
  const clean = ranked.filter((r) => !r.flagged);
  const flagged = ranked.filter((r) => r.flagged);
  let decisions = 0;
  let comments = 0;
  const decide = async (
    ids: (string | undefined)[],
    status: "confirmed" | "advance" | "on-hold" | "dropped",
    why: string,
  ) => {
    const list = ids.filter((x): x is string => !!x);
    if (list.length === 0) return;
    decisions += (await setTriageStatus(lead, ctx.mainCampaignId, list, status, why)).changed;
  };
  await decide(
    [clean[0]?.id, clean[1]?.id, clean[2]?.id],
    "confirmed",
    "Potent and clean in the mechanism study (invented demo decision).",
  );
  await decide(
    [clean[0]?.id],
    "advance",
    "Best Ki of the series; order resynthesis for selectivity panel (invented demo decision).",
  );
  await decide(
    [flagged[0]?.id],
    "on-hold",
    "Fit is flagged; repeat the dose-response before deciding (invented demo decision).",
  );
  await decide([ranked[ranked.length - 1]?.id], "dropped", "Weak in the single-dose screen (invented demo decision).");
  const note = async (email: string, id: string | undefined, body: string) => {
    if (!id) return;
    await addComment(person(email), ctx.mainCampaignId, id, body);
    comments += 1;
  };
  await note(
    "chemist@example.org",
    clean[0]?.id,
    "Second batch in synthesis, 50 mg expected next week (invented demo comment).",
  );
  await note(
    "assay@example.org",
    flagged[0]?.id,
    "Hill slope looked steep; will re-test with 0.01 % Triton X-100 (invented demo comment).",
  );
  await note(
    "lead@example.org",
    clean[1]?.id,
    "Check for the same mechanism in the Kelpin counter-screen (invented demo comment).",
  );
  // Keep the query planner's statistics fresh for the grid after the bulk writes of the seed.
  await db.execute(sql`analyze hit_rows`);
  return { decisions, comments };
}
