import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { plateMaps, plateRuns } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import { plateMapFromWells } from "@/lib/plates";
import { audit } from "../audit";
import { createPlateMap, loadPlateMapRow } from "./plate-maps";

/** How many plate runs were uploaded against a plate map. */
async function runsUsing(mapId: string): Promise<number> {
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(plateRuns)
    .where(eq(plateRuns.plateMapId, mapId));
  return row?.n ?? 0;
}

/** One plate map with its listed wells and how many runs use it (404 outside the campaign). */
export async function plateMapWithUse(campaignId: string, mapId: string) {
  const row = await loadPlateMapRow(campaignId, mapId);
  return { ...row, runs: await runsUsing(mapId) };
}

/**
 * Save a copy of a plate map under a new name, as a template (the usual way to change a map that
 * runs already use). The copy goes through the same checks as a new map (name, compounds).
 */
export async function copyPlateMap(
  actor: Actor,
  campaignId: string,
  mapId: string,
  name: string,
): Promise<{ id: string }> {
  const src = await loadPlateMapRow(campaignId, mapId);
  return createPlateMap(actor, campaignId, {
    name,
    map: plateMapFromWells(src.format, src.wells),
    isTemplate: true,
    signalDirection: src.signalDirection,
  });
}

/** Delete a plate map no run uses (audited); 409 with a sentence when runs were uploaded against it. */
export async function deletePlateMap(actor: Actor, campaignId: string, mapId: string): Promise<void> {
  await db.transaction(async (tx) => {
    const [old] = await tx
      .select()
      .from(plateMaps)
      .where(and(eq(plateMaps.id, mapId), eq(plateMaps.campaignId, campaignId)))
      .for("update");
    if (!old) throw new AppError("not_found", "No such plate map in this campaign.");
    const [used] = await tx
      .select({ n: sql<number>`count(*)::int` })
      .from(plateRuns)
      .where(eq(plateRuns.plateMapId, mapId));
    const n = used?.n ?? 0;
    if (n > 0)
      throw new AppError(
        "conflict",
        `${n} plate ${n === 1 ? "run was" : "runs were"} uploaded against plate map "${old.name}", so it is kept with ${n === 1 ? "that run" : "them"}.`,
      );
    await tx.delete(plateMaps).where(eq(plateMaps.id, mapId));
    await audit(tx, actor, {
      campaignId,
      action: "plate_map.delete",
      entityType: "plate_map",
      entityId: mapId,
      before: { name: old.name, format: old.format, sampleWells: old.sampleWells },
    });
  });
}
