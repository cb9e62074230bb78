// Helpers of the plate service tests: the fixture files and their truth table, multipart bodies
// for the plate-map and plate-run routes, row counts and the object store. The fixtures are
// INVENTED data (fixtures/plates/README.md).
import crypto from "node:crypto";
import fs from "node:fs";
import { expect } from "vitest";
import { sql } from "drizzle-orm";
import { callRoute, type World } from "./harness";
import { db } from "@/server/db/client";
import { getObject } from "@/server/storage/s3";
import { s3KeyFor } from "@/server/services/plates";
import * as plateMapsRoute from "@/app/api/campaigns/[campaignId]/plate-maps/route";
import * as plateRunsRoute from "@/app/api/campaigns/[campaignId]/plate-runs/route";

export const dir = "fixtures/plates";
type Truth = {
  good: { file: string; map: string; format: number; shape: string; reads: number; wells: number }[];
  bad: { file: string; parseAs: "reader-export" | "plate-map"; format?: number; case: string; error: string }[];
};
export const truth = JSON.parse(fs.readFileSync(`${dir}/truth.json`, "utf8")) as Truth;

export const sha = (b: Uint8Array) => crypto.createHash("sha256").update(b).digest("hex");
export const bytesOf = (p: string) => new Uint8Array(fs.readFileSync(p));

export function form(
  fields: Record<string, string>,
  file?: { name: string; bytes: Uint8Array; type?: string },
): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.append(k, v);
  if (file) f.append("file", new File([new Uint8Array(file.bytes)], file.name, { type: file.type ?? "text/csv" }));
  return f;
}

/** Plate maps, runs and readings in the whole database (a refused request must leave them as they were). */
export async function counts() {
  const [r] = await db.execute<{ runs: number; readings: number; maps: number }>(sql`
    select (select count(*)::int from plate_runs) as runs, (select count(*)::int from well_readings) as readings, (select count(*)::int from plate_maps) as maps`);
  return r!;
}

export async function objectExists(sha256: string): Promise<boolean> {
  return getObject(s3KeyFor(sha256)).then(
    () => true,
    () => false,
  );
}

/** Route calls as the world's assay scientist, and one fixture plate map per format (made once). */
export function plateRoutes(world: () => World) {
  async function postMap(name: string, format: number, csv: Uint8Array, fileName = "map.csv") {
    const w = world();
    return callRoute(plateMapsRoute.POST, {
      user: w.people.assay,
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/plate-maps`,
      params: { campaignId: w.campaignId },
      body: form({ name, format: String(format) }, { name: fileName, bytes: csv }),
    });
  }

  async function postRun(plateMapId: string, name: string, bytes: Uint8Array, extra: Record<string, string> = {}) {
    const w = world();
    return callRoute(plateRunsRoute.POST, {
      user: w.people.assay,
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/plate-runs`,
      params: { campaignId: w.campaignId },
      body: form({ plateMapId, ...extra }, { name, bytes }),
    });
  }

  const maps = new Map<number, string>();
  async function mapFor(format: number): Promise<string> {
    if (!maps.has(format)) {
      const file =
        format === 96
          ? "single-dose-96.map.csv"
          : format === 384
            ? "dose-response-384.map.csv"
            : "single-dose-1536.map.csv";
      const r = await postMap(`Fixture map ${format}`, format, bytesOf(`${dir}/${file}`), file);
      expect(r.status).toBe(201);
      maps.set(format, (r.json as { id: string }).id);
    }
    return maps.get(format)!;
  }

  return { postMap, postRun, mapFor };
}
