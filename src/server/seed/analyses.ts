import "server-only";
import { and, eq, like, sql } from "drizzle-orm";
import type { Db } from "@/server/db/client";
import { campaigns, compoundResults, plateRuns, users } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { analyseNow, createExperiment } from "@/server/services/analyses";
import { DEMO_SUBSTRATE_UM } from "@/lib/plates/demo-campaign";

/**
 * The invented demo campaign's experiments, analysed at seed time (in this process, not queued)
 * so the demo opens with results: the single-dose screen, the dose-response plates (assay [S] =
 * Km = 20 µM, for the Cheng–Prusoff cross-check) and the mechanism study (after dose-response, so
 * the cross-check finds the measured IC50s).
 */
export async function seedAnalyses(
  db: Db,
  ctx: { mainCampaignId: string; userIds: Record<string, string> },
): Promise<{ experiments: number; results: number }> {
  const [campaign] = await db.select().from(campaigns).where(eq(campaigns.id, ctx.mainCampaignId));
  const [assay] = await db.select().from(users).where(eq(users.id, ctx.userIds["assay@example.org"]!));
  const actor = { id: assay!.id, email: assay!.email };
  const runsLike = async (prefix: string) =>
    (
      await db
        .select({ id: plateRuns.id })
        .from(plateRuns)
        .where(and(eq(plateRuns.campaignId, ctx.mainCampaignId), like(plateRuns.fileName, `${prefix}%`)))
    ).map((r) => r.id);
  const plans = [
    { name: "Primary screen at 10 µM (invented demo)", kind: "single-dose" as const, prefix: "screen-", settings: {} },
    {
      name: "Dose-response confirmation (invented demo)",
      kind: "dose-response" as const,
      prefix: "dose-response-",
      settings: { substrateUm: DEMO_SUBSTRATE_UM },
    },
    {
      name: "Mechanism study, four hits (invented demo)",
      kind: "mechanism" as const,
      prefix: "mechanism-",
      settings: {},
    },
  ];
  let results = 0;
  let experiments = 0;
  for (const p of plans) {
    const runIds = await runsLike(p.prefix);
    if (runIds.length === 0) continue;
    const { id } = await createExperiment(actor, campaign!, {
      name: p.name,
      kind: p.kind,
      runIds,
      settings: p.settings,
    });
    experiments += 1;
    // Computed here rather than queued: the worker may not be running while the seed does.
    // An experiment with nothing to analyse (no accepted run) is skipped.
    const a = await analyseNow(actor, campaign!, id).catch((e: unknown) => {
      if (e instanceof AppError) return null;
      throw e;
    });
    if (!a) continue;
    const [row] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(compoundResults)
      .where(eq(compoundResults.analysisId, a.id));
    results += row?.n ?? 0;
  }
  return { experiments, results };
}
