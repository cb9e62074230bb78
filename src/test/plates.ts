// Test set-up for plate tests: a small INVENTED 96-well plate map and endpoint exports built from
// a small worked example of controls (vehicle mean 1000, SD 31.6; full inhibition mean 100, SD 7.07: Z′ 0.871 by
// the definition of Zhang, Chung & Oldenburg, J Biomol Screen 1999), stored through the real services.
import { createPlateMap, uploadRun } from "@/server/services/plates";
import { db } from "@/server/db/client";
import { campaigns } from "@/server/db/schema";
import { eq } from "drizzle-orm";
import { plateMapFromWells, type PlateMapWell } from "@/lib/plates";
import type { World } from "./harness";
import { DEFAULT_REGISTRY_PREFIX, formatRegistryId } from "@/lib/registry-id";
import { ensureCompoundsRegistered } from "./compounds";

/** Registry IDs INH-000001 … INH-<n> (invented demo structures registered by the compounds helper). */
export const registryIds = (n: number) =>
  Array.from({ length: n }, (_, i) => formatRegistryId(DEFAULT_REGISTRY_PREFIX, i + 1));

export const NEUTRAL = [950, 1010, 1040, 980, 1020, 1000];
export const FULL = [90, 110, 95, 105, 100, 100];

/** Neutral controls A1–A6, full-inhibition B1–B6, samples C1–C12 (INH-000001… at 10 µM). */
export function smallMap(swap = false) {
  const wells: PlateMapWell[] = [];
  NEUTRAL.forEach((_, i) => wells.push({ well: `A${i + 1}`, role: swap ? "full" : "neutral" }));
  FULL.forEach((_, i) => wells.push({ well: `B${i + 1}`, role: swap ? "neutral" : "full" }));
  for (let c = 1; c <= 12; c++)
    wells.push({
      well: `C${c}`,
      role: "sample",
      compound: formatRegistryId(DEFAULT_REGISTRY_PREFIX, c),
      concentrationUm: 10,
    });
  return plateMapFromWells(96, wells);
}

/** A long endpoint export for smallMap; `salt` changes one digit so each file has its own SHA-256. */
export function smallExport(salt = 0, extra: string[] = []): Uint8Array<ArrayBuffer> {
  const lines = [
    `Invented test plate ${salt}`,
    "well,value",
    ...NEUTRAL.map((v, i) => `A${i + 1},${v}`),
    ...FULL.map((v, i) => `B${i + 1},${v}`),
  ];
  for (let c = 1; c <= 12; c++) lines.push(`C${c},${c === 1 ? 550 : 900 + c}`);
  lines.push(...extra);
  return new TextEncoder().encode(lines.join("\n") + "\n");
}

export async function campaignRow(id: string) {
  const [c] = await db.select().from(campaigns).where(eq(campaigns.id, id));
  return c!;
}

const cache = new Map<string, Promise<{ mapId: string; runId: string }>>();

/** A plate map and one uploaded run in the world's campaign (made once per world). */
export function platesWorld(w: World): Promise<{ mapId: string; runId: string }> {
  let p = cache.get(w.tag);
  if (!p) {
    p = (async () => {
      await ensureCompoundsRegistered(registryIds(12));
      const { id: mapId } = await createPlateMap(w.people.assay, w.campaignId, {
        name: `Matrix map ${w.tag}`,
        map: smallMap(),
      });
      const run = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
        plateMapId: mapId,
        fileName: `matrix-${w.tag}.csv`,
        contentType: "text/csv",
        bytes: smallExport(Number.parseInt(w.tag, 16)),
      });
      return { mapId, runId: run.id };
    })();
    cache.set(w.tag, p);
  }
  return p;
}
