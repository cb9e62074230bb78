// Plate maps against the real Postgres: the CSV import through the API, every bad map with its
// exact message and nothing written, registry IDs, edits and name clashes.
// The plates are INVENTED data (fixtures/plates/README.md; test helpers in src/test/plates.ts).
import { describe, it, expect, beforeAll } from "vitest";
import { eq } from "drizzle-orm";
import { callAction, makeWorld, type World } from "@/test/harness";
import { campaignRow, registryIds, smallExport, smallMap } from "@/test/plates";
import { bytesOf, counts, dir, plateRoutes, truth } from "@/test/plate-routes";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { db } from "@/server/db/client";
import { plateMaps } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { createPlateMap, updatePlateMap, uploadRun } from ".";
import { plateMapToCsv } from "@/lib/plates";
import { liveParseWorkers } from "@/server/workers/upload-parse-pool";
import * as plateActions from "@/app/(workspace)/campaigns/[campaignId]/plates/actions";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
  // The fixture plate maps used here name INH-000001 … INH-000064.
  await ensureCompoundsRegistered(registryIds(64));
});
const { postMap, mapFor } = plateRoutes(() => w);

describe("plate maps", () => {
  it("imports a plate map CSV through the API (201 {id}) and stores its wells", async () => {
    const id = await mapFor(96);
    const [row] = await db.select().from(plateMaps).where(eq(plateMaps.id, id));
    expect(row!.format).toBe(96);
    expect(row!.sampleWells).toBe(64);
    expect(row!.neutralWells).toBe(16);
    expect(row!.fullWells).toBe(16);
  });

  for (const bad of truth.bad.filter((b) => b.parseAs === "plate-map")) {
    it(`refuses ${bad.case} with the exact message and writes nothing`, async () => {
      const before = await counts();
      const name = bad.file.split("/").pop()!;
      const r = await postMap(`Bad ${name}`, bad.format ?? 96, bytesOf(`${dir}/${bad.file}`), name);
      expect(r.status).toBe(400);
      const body = r.json as { error: string; details: { line?: number; well?: string; message: string }[] };
      expect(body.error.replace(/ \(and \d+ more\)$/, "")).toBe(bad.error);
      expect(bad.error.endsWith(body.details[0]!.message)).toBe(true);
      expect(await counts()).toEqual(before);
    });
  }

  it("refuses a compound that is not a registry ID, naming the well", async () => {
    const m = smallMap();
    const csv = plateMapToCsv(m).replace("C5,sample,INH-000005", "C5,sample,ABC-5");
    const before = await counts();
    const r = await postMap("Bad compound", 96, new TextEncoder().encode(csv));
    expect(r.status).toBe(400);
    expect(r.json).toMatchObject({
      error: 'well C5: compound "ABC-5" is not a registry ID (expected e.g. INH-000123)',
      details: [{ well: "C5" }],
    });
    expect(await counts()).toEqual(before);
  });

  it("refuses a compound that is not in the compound registry, naming the first well that uses it", async () => {
    const csv = plateMapToCsv(smallMap())
      .replace("C5,sample,INH-000005", "C5,sample,INH-987654")
      .replace("C6,sample,INH-000006", "C6,sample,INH-987654");
    const before = await counts();
    const r = await postMap("Unregistered compound", 96, new TextEncoder().encode(csv));
    expect(r.status).toBe(400);
    expect(r.json).toMatchObject({
      error: "well C5: compound INH-987654 is not in the compound registry; register it first",
      details: [{ well: "C5" }],
    });
    expect(await counts()).toEqual(before);
  });

  it("reads INH-1000000 as a registry ID (the registry writes numbers from 1,000,000 on in full)", async () => {
    // The ID passes the format check and reaches the registry look-up, which does not know it.
    const csv = plateMapToCsv(smallMap()).replace("C5,sample,INH-000005", "C5,sample,INH-1000000");
    const before = await counts();
    const r = await postMap("Seven-digit compound", 96, new TextEncoder().encode(csv));
    expect(r.status).toBe(400);
    expect(r.json).toMatchObject({
      error: "well C5: compound INH-1000000 is not in the compound registry; register it first",
      details: [{ well: "C5" }],
    });
    expect(await counts()).toEqual(before);
  });

  it("edits a plate map no run has used; a used map is kept as it was (409)", async () => {
    const { id } = await createPlateMap(w.people.assay, w.campaignId, { name: "Editable", map: smallMap() });
    const changed = smallMap(true);
    await updatePlateMap(w.people.assay, w.campaignId, id, { name: "Editable (swapped)", map: changed });
    const [row] = await db.select().from(plateMaps).where(eq(plateMaps.id, id));
    expect(row!.name).toBe("Editable (swapped)");
    expect(row!.wells.find((x) => x.well === "A1")!.role).toBe("full");
    await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
      plateMapId: id,
      fileName: "editable.csv",
      contentType: "text/csv",
      bytes: smallExport(31),
    });
    const e = (await updatePlateMap(w.people.assay, w.campaignId, id, {
      name: "Editable again",
      map: smallMap(),
    }).catch((x: unknown) => x)) as AppError;
    expect(e.status).toBe(409);
    expect(e.message).toBe(
      "Plate runs were uploaded against this plate map, so it is kept as it was. Save your changes as a new plate map.",
    );
  });

  it("reads the CSV and the editor's JSON in the upload-parse pool, with the same answers", async () => {
    // Nothing in this file starts a parse worker but the plate-map reads (the first test imported a map).
    expect(liveParseWorkers()).toBeGreaterThan(0);
    const before = await counts();
    const hostile = await postMap("Hostile header (invented)", 96, new TextEncoder().encode("w".repeat(1900 * 1024)));
    expect(hostile.status).toBe(400);
    expect((hostile.json as { error: string }).error.length).toBeLessThan(2100);
    const bad = await callAction(
      plateActions.savePlateMapAction,
      { campaignId: w.campaignId, name: "Editor map (invented)", signalDirection: "falls", mapJson: "{not json" },
      w.people.assay,
    );
    expect(bad).toMatchObject({
      kind: "state",
      state: { ok: false, error: "The plate map could not be read (it is not JSON)." },
    });
    expect(await counts()).toEqual(before);
    const m = smallMap();
    const good = await callAction(
      plateActions.savePlateMapAction,
      {
        campaignId: w.campaignId,
        name: "Editor map (invented)",
        signalDirection: "falls",
        mapJson: JSON.stringify({ format: 96, wells: m.wells.filter((x) => x.role !== "empty") }),
      },
      w.people.assay,
    );
    expect(good).toMatchObject({ kind: "state", state: { ok: true } });
  });

  it("refuses a second plate map with the same name (409)", async () => {
    const r = await postMap("Fixture map 96", 96, bytesOf(`${dir}/single-dose-96.map.csv`));
    expect(r.status).toBe(409);
  });
});
