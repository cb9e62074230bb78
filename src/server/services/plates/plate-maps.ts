import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { compounds, plateMaps, plateRuns, users } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import { isUniqueViolation } from "@/server/db/sql-helpers";
import { formatRegistryId, registryIdRe } from "@/server/registry-id";
import {
  countRoles,
  formulaInjectionMessage,
  issue,
  plateMapFromWells,
  type PlateIssue,
  type PlateMap,
  type PlateMapWell,
} from "@/lib/plates";
import type { SignalDirection } from "@/lib/plates/run-qc";
import { audit } from "../audit";
import { issuesError } from "./errors";

/**
 * Every compound on a plate map must be a registry ID (format) of a registered compound
 * (the compounds table of the registry). Problems name the well; an ID missing from the registry
 * is reported once per ID with the first well that uses it.
 */
async function compoundIssues(map: PlateMap): Promise<PlateIssue[]> {
  const out: PlateIssue[] = [];
  const firstWell = new Map<string, string>();
  for (const w of map.wells) {
    if (w.compound === undefined) continue;
    if (!registryIdRe.test(w.compound))
      out.push(
        issue(
          { well: w.well },
          `compound "${w.compound.slice(0, 40)}" is not a registry ID (expected e.g. ${formatRegistryId(123)})`,
        ),
      );
    else if (!firstWell.has(w.compound)) firstWell.set(w.compound, w.well);
  }
  if (firstWell.size > 0) {
    const ids = [...firstWell.keys()];
    const found = new Set(
      (await db.select({ id: compounds.registryId }).from(compounds).where(inArray(compounds.registryId, ids))).map(
        (r) => r.id,
      ),
    );
    for (const id of ids)
      if (!found.has(id))
        out.push(
          issue({ well: firstWell.get(id)! }, `compound ${id} is not in the compound registry; register it first`),
        );
  }
  return out.slice(0, 50);
}

export type PlateMapInput = {
  name: string;
  map: PlateMap;
  isTemplate?: boolean;
  signalDirection?: SignalDirection;
};

function listedWells(map: PlateMap): PlateMapWell[] {
  return map.wells.filter(
    (w) =>
      w.role !== "empty" ||
      w.compound !== undefined ||
      w.concentrationUm !== undefined ||
      w.substrateUm !== undefined ||
      w.group !== undefined,
  );
}

function checkName(name: string): string {
  const n = name.trim();
  if (n === "") throw new AppError("bad_request", "Give the plate map a name.");
  if (n.length > 120) throw new AppError("bad_request", "A plate map name has at most 120 characters.");
  const inj = formulaInjectionMessage(n);
  if (inj) throw new AppError("bad_request", `Name ${inj}.`);
  return n;
}

/** The name, the compounds and the role counts of a plate map about to be written. */
async function checkedInput(input: PlateMapInput) {
  const name = checkName(input.name);
  const bad = await compoundIssues(input.map);
  if (bad.length > 0) throw issuesError(bad);
  return { name, counts: countRoles(input.map) };
}

function nameTaken(e: unknown, name: string): unknown {
  return isUniqueViolation(e)
    ? new AppError("conflict", `A plate map named "${name}" already exists in this campaign.`)
    : e;
}

/** Save a new plate map (already validated by the plate library); compound IDs are checked here. */
export async function createPlateMap(actor: Actor, campaignId: string, input: PlateMapInput): Promise<{ id: string }> {
  const { name, counts } = await checkedInput(input);
  try {
    return await db.transaction(async (tx) => {
      const [row] = await tx
        .insert(plateMaps)
        .values({
          campaignId,
          name,
          format: input.map.format,
          isTemplate: input.isTemplate ?? false,
          signalDirection: input.signalDirection ?? "falls",
          wells: listedWells(input.map),
          sampleWells: counts.sample,
          neutralWells: counts.neutral,
          fullWells: counts.full,
          createdBy: actor.id,
          updatedBy: actor.id,
        })
        .returning({ id: plateMaps.id });
      await audit(tx, actor, {
        campaignId,
        action: "plate_map.create",
        entityType: "plate_map",
        entityId: row!.id,
        after: { name, format: input.map.format, ...counts },
      });
      return { id: row!.id };
    });
  } catch (e) {
    throw nameTaken(e, name);
  }
}

/** Change a plate map that no run has used yet (a used map is kept as it was: save a copy instead). */
export async function updatePlateMap(
  actor: Actor,
  campaignId: string,
  mapId: string,
  input: PlateMapInput,
): Promise<{ id: string }> {
  const { name, counts } = await checkedInput(input);
  try {
    return await db.transaction(async (tx) => {
      const [old] = await tx
        .select()
        .from(plateMaps)
        .where(and(eq(plateMaps.id, mapId), eq(plateMaps.campaignId, campaignId)))
        .for("update");
      if (!old) throw new AppError("not_found", "No such plate map in this campaign.");
      if (old.format !== input.map.format)
        throw new AppError("bad_request", `This plate map is ${old.format}-well; its format cannot change.`);
      const [used] = await tx
        .select({ id: plateRuns.id })
        .from(plateRuns)
        .where(eq(plateRuns.plateMapId, mapId))
        .limit(1);
      if (used)
        throw new AppError(
          "conflict",
          "Plate runs were uploaded against this plate map, so it is kept as it was. Save your changes as a new plate map.",
        );
      await tx
        .update(plateMaps)
        .set({
          name,
          isTemplate: input.isTemplate ?? old.isTemplate,
          signalDirection: input.signalDirection ?? old.signalDirection,
          wells: listedWells(input.map),
          sampleWells: counts.sample,
          neutralWells: counts.neutral,
          fullWells: counts.full,
          updatedBy: actor.id,
          updatedAt: new Date(),
        })
        .where(eq(plateMaps.id, mapId));
      await audit(tx, actor, {
        campaignId,
        action: "plate_map.update",
        entityType: "plate_map",
        entityId: mapId,
        before: { name: old.name, sampleWells: old.sampleWells },
        after: { name, ...counts },
      });
      return { id: mapId };
    });
  } catch (e) {
    throw nameTaken(e, name);
  }
}

export async function listPlateMaps(campaignId: string) {
  return db
    .select({
      id: plateMaps.id,
      name: plateMaps.name,
      format: plateMaps.format,
      isTemplate: plateMaps.isTemplate,
      signalDirection: plateMaps.signalDirection,
      sampleWells: plateMaps.sampleWells,
      neutralWells: plateMaps.neutralWells,
      fullWells: plateMaps.fullWells,
      updatedAt: plateMaps.updatedAt,
      createdBy: users.name,
      runs: sql<number>`(select count(*)::int from ${plateRuns} where ${plateRuns.plateMapId} = ${plateMaps.id})`,
    })
    .from(plateMaps)
    .leftJoin(users, eq(users.id, plateMaps.createdBy))
    .where(eq(plateMaps.campaignId, campaignId))
    .orderBy(desc(plateMaps.isTemplate), asc(plateMaps.name));
}

/** One plate map row of this campaign, or 404. */
export async function loadPlateMapRow(campaignId: string, mapId: string) {
  const [row] = await db
    .select()
    .from(plateMaps)
    .where(and(eq(plateMaps.id, mapId), eq(plateMaps.campaignId, campaignId)));
  if (!row) throw new AppError("not_found", "No such plate map in this campaign.");
  return row;
}

export async function getPlateMap(campaignId: string, mapId: string) {
  const row = await loadPlateMapRow(campaignId, mapId);
  return { ...row, map: plateMapFromWells(row.format, row.wells) };
}
