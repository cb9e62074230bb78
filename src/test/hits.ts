// Test set-up for the hit grid: INVENTED results for INH-000001…INH-000012 written straight into
// compound_results for a test campaign (not reference data), then the hit rows refreshed. The
// tests check what the product does with them, not the numbers themselves.
import crypto from "node:crypto";
import { db } from "@/server/db/client";
import { analyses, compoundResults, experiments } from "@/server/db/schema";
import { refreshHitRows } from "@/server/services/hits";
import type { ResultDetail } from "@/lib/analysis/detail";
import type { InhibitionModel } from "@/lib/kinetics/inhibition-models";
import * as hitsRoute from "@/app/api/campaigns/[campaignId]/hits/route";
import { makeWorld, callRoute, type World } from "./harness";
import { platesWorld, registryIds } from "./plates";

export type Kind = "single-dose" | "dose-response" | "mechanism";
export type Invented = {
  id: string;
  pct?: number;
  ic50?: number;
  ki?: number;
  mech?: InhibitionModel;
  label?: "clear" | "ambiguous";
  flags?: string[];
};

// INVENTED results for INH-000001…INH-000012.
export const invented: Invented[] = [
  { id: "INH-000001", pct: 92, ic50: 0.5 },
  { id: "INH-000002", pct: 88, ic50: 0.03, ki: 0.01, mech: "competitive", label: "clear" },
  { id: "INH-000003", pct: 95, ic50: 0.1, flags: ["hill-outside-0.5-2"] },
  { id: "INH-000004", pct: 71 },
  { id: "INH-000005", pct: 80, ic50: 5, ki: 0.5, mech: "mixed", label: "clear" },
  { id: "INH-000006", pct: 85, ic50: 1, ki: 0.05, mech: "noncompetitive", label: "ambiguous" },
  { id: "INH-000007", pct: 90, ic50: 0.2, ki: 0.02, mech: "uncompetitive", label: "clear", flags: ["ki-ci-unbounded"] },
  { id: "INH-000008", pct: -5 },
  { id: "INH-000009", pct: 40, ic50: 2 },
  { id: "INH-000010", pct: 65 },
  { id: "INH-000011", pct: 12 },
  { id: "INH-000012", pct: 99, ic50: 0.03, ki: 0.2, mech: "competitive", label: "clear" },
];

export const hitIds = registryIds(12);

/**
 * The smallest stored detail each kind's schema accepts (src/lib/analysis/detail.ts): the hit
 * grid reads only the columns; the panel reads the detail.
 */
export const inventedDetail = (kind: Kind): ResultDetail =>
  kind === "single-dose"
    ? { thresholdPct: 50, rule: { kind: "percent", thresholdPercent: 50 }, concentrationsUm: [10] }
    : kind === "dose-response"
      ? { points: [] }
      : { reason: "invented result: no fit", points: [] };

/** One finished, current analysis of `kind` with the given invented rows; returns its experiment. */
export async function addAnalysis(
  w: World,
  runId: string,
  kind: Kind,
  rows: Invented[],
  detailOf: (r: Invented) => ResultDetail = () => inventedDetail(kind),
): Promise<{ experimentId: string }> {
  const [e] = await db
    .insert(experiments)
    .values({ campaignId: w.campaignId, name: `Invented ${kind} ${w.tag}`, kind })
    .returning();
  const inputs = {
    engineVersion: "test",
    kind,
    settings: { resolved: { hitThresholdPct: 50, kmUm: null, enzymeNm: null } },
    runs: [{ id: runId, sha256: "x", fileName: "x", decision: "accepted" }],
    masks: [],
  };
  const [a] = await db
    .insert(analyses)
    .values({
      experimentId: e!.id,
      campaignId: w.campaignId,
      status: "done",
      progress: 1,
      engineVersion: "test",
      inputHash: crypto.randomUUID(),
      inputs,
      isCurrent: true,
      finishedAt: new Date(),
    })
    .returning();
  await db.insert(compoundResults).values(
    rows.map((r) => ({
      analysisId: a!.id,
      experimentId: e!.id,
      campaignId: w.campaignId,
      kind,
      compoundId: r.id,
      nPoints: 4,
      pctInhibition: kind === "single-dose" ? r.pct : null,
      hit: kind === "single-dose" ? (r.pct ?? 0) >= 50 : null,
      ic50Um: kind === "dose-response" ? r.ic50 : null,
      ic50LoUm: kind === "dose-response" ? r.ic50! / 2 : null,
      ic50HiUm: kind === "dose-response" ? r.ic50! * 2 : null,
      hill: kind === "dose-response" ? 1 : null,
      mechanism: kind === "mechanism" ? r.mech : null,
      mechanismLabel: kind === "mechanism" ? r.label : null,
      kiUm: kind === "mechanism" ? r.ki : null,
      kicUm: kind === "mechanism" ? r.ki : null,
      flags:
        (kind === "dose-response" && r.flags?.[0]?.startsWith("hill")) ||
        (kind === "mechanism" && r.flags?.[0]?.startsWith("ki"))
          ? r.flags!
          : [],
      detail: detailOf(r),
    })),
  );
  return { experimentId: e!.id };
}

/** A new world whose campaign holds the invented single-dose, dose-response and mechanism results. */
export async function hitsWorld(): Promise<{ w: World; runId: string }> {
  const w = await makeWorld();
  const { runId } = await platesWorld(w);
  await addAnalysis(w, runId, "single-dose", invented);
  await addAnalysis(
    w,
    runId,
    "dose-response",
    invented.filter((r) => r.ic50 !== undefined),
  );
  await addAnalysis(
    w,
    runId,
    "mechanism",
    invented.filter((r) => r.ki !== undefined),
  );
  await db.transaction((tx) => refreshHitRows(tx, w.campaignId, hitIds));
  return { w, runId };
}

/** GET …/hits of the world's campaign (read when called), and the registry IDs of a page in order. */
export function hitsApi(world: () => World) {
  const base = () => `/api/campaigns/${world().campaignId}/hits`;
  const list = async (qs: string, user = world().people.lead) =>
    callRoute(hitsRoute.GET, { user, path: `${base()}?${qs}`, params: { campaignId: world().campaignId } });
  const order = (j: unknown) => (j as { items: { registryId: string }[] }).items.map((i) => i.registryId);
  return { base, list, order };
}
