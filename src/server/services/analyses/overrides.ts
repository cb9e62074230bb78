import "server-only";
import { db } from "@/server/db/client";
import { mechanismOverrides } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import type { InhibitionModel } from "@/lib/kinetics";
import { audit } from "../audit";
import { refreshHitRows } from "../hits";
import { getExperiment } from "./experiments";
import { compoundResultDetail } from "./results";

/** A lead or assay scientist overrides the chosen mechanism with a reason (audited). */
export async function overrideMechanism(
  actor: Actor,
  campaignId: string,
  experimentId: string,
  compoundId: string,
  model: InhibitionModel,
  reason: string,
): Promise<void> {
  const e = await getExperiment(campaignId, experimentId);
  if (e.kind !== "mechanism") throw new AppError("bad_request", "Only mechanism studies have a model choice.");
  const current = await compoundResultDetail(experimentId, compoundId);
  await db.transaction(async (tx) => {
    await tx.insert(mechanismOverrides).values({ experimentId, compoundId, model, reason, by: actor.id });
    await audit(tx, actor, {
      campaignId,
      action: "mechanism.override",
      entityType: "compound-result",
      entityId: `${experimentId}/${compoundId}`,
      before: { model: current.override?.model ?? current.mechanism },
      after: { model },
      reason,
    });
    await refreshHitRows(tx, campaignId, [compoundId]);
  });
}
