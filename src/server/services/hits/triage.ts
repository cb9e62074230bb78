import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { db } from "@/server/db/client";
import { hitComments, hitRows, triageDecisions } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import type { TriageStatus } from "@/lib/hits/query";
import { audit } from "../audit";
import { refreshHitRows } from "./refresh";

/**
 * Sets the triage status of one or more compounds, with an optional comment, in one
 * transaction: a history row and an audit row per compound that changes, then the hit rows.
 * Any unknown compound refuses the whole request (nothing written). Setting the status a
 * compound already has changes nothing and is not recorded.
 */
export async function setTriageStatus(
  actor: Actor,
  campaignId: string,
  registryIds: string[],
  status: TriageStatus,
  comment?: string,
) {
  const ids = [...new Set(registryIds)];
  return db.transaction(async (tx) => {
    const rows = await tx
      .select({ compoundId: hitRows.compoundId, status: hitRows.status })
      .from(hitRows)
      .where(and(eq(hitRows.campaignId, campaignId), inArray(hitRows.compoundId, ids)))
      .for("update");
    const known = new Map(rows.map((r) => [r.compoundId, r.status]));
    const missing = ids.filter((i) => !known.has(i));
    if (missing.length) {
      throw new AppError(
        ids.length === 1 ? "not_found" : "bad_request",
        `No result in this campaign for ${missing.slice(0, 5).join(", ")}${missing.length > 5 ? ` and ${missing.length - 5} more` : ""}. Nothing was changed.`,
        {
          details: missing
            .slice(0, 50)
            .map((m) => ({ field: "registryIds", message: `${m} has no current result in this campaign.` })),
        },
      );
    }
    const changing = ids.filter((i) => known.get(i) !== status);
    if (changing.length) {
      await tx.insert(triageDecisions).values(
        changing.map((compoundId) => ({
          campaignId,
          compoundId,
          fromStatus: known.get(compoundId)!,
          toStatus: status,
          comment: comment || null,
          by: actor.id,
        })),
      );
      for (const compoundId of changing) {
        await audit(tx, actor, {
          campaignId,
          action: "triage.status",
          entityType: "compound",
          entityId: compoundId,
          before: { status: known.get(compoundId) },
          after: { status },
          reason: comment || null,
        });
      }
      await refreshHitRows(tx, campaignId, changing);
    }
    return { changed: changing.length, unchanged: ids.length - changing.length, status };
  });
}

/** A comment on a compound in the campaign (members who may comment). */
export async function addComment(actor: Actor, campaignId: string, registryId: string, body: string) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ id: hitRows.compoundId })
      .from(hitRows)
      .where(and(eq(hitRows.campaignId, campaignId), eq(hitRows.compoundId, registryId)));
    if (!row) throw new AppError("not_found", `No result in this campaign for ${registryId}.`);
    const [c] = await tx
      .insert(hitComments)
      .values({ campaignId, compoundId: registryId, body, by: actor.id })
      .returning({ id: hitComments.id, at: hitComments.at });
    await refreshHitRows(tx, campaignId, [registryId]);
    return { id: c!.id, at: c!.at.toISOString() };
  });
}
