// Plate runs: every bad upload is refused with its exact message, and nothing is left behind in
// Postgres or the S3 fake (including an upload killed halfway through its readings).
// The plates are INVENTED data (fixtures/plates/README.md; test helpers in src/test/plates.ts).
import { describe, it, expect, beforeAll } from "vitest";
import fs from "node:fs";
import { eq, sql } from "drizzle-orm";
import { makeWorld, type World } from "@/test/harness";
import { campaignRow, registryIds, smallExport, smallMap } from "@/test/plates";
import { bytesOf, counts, dir, objectExists, plateRoutes, sha, truth } from "@/test/plate-routes";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { db } from "@/server/db/client";
import { plateRuns } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { createPlateMap, uploadRun } from ".";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
  // The fixture plate maps used here name INH-000001 … INH-000064.
  await ensureCompoundsRegistered(registryIds(64));
});
const { postRun, mapFor } = plateRoutes(() => w);

describe("plate runs: bad input is refused with its exact message and leaves nothing behind", () => {
  for (const bad of truth.bad.filter((b) => b.parseAs === "reader-export")) {
    it(`${bad.case}: ${bad.error.slice(0, 60)}…`, async () => {
      const mapId = await mapFor(bad.format ?? 96);
      const before = await counts();
      const bytes = bytesOf(`${dir}/${bad.file}`);
      const r = await postRun(mapId, bad.file.split("/").pop()!, bytes);
      expect(r.status).toBe(400);
      const body = r.json as { error: string; details: { line?: number; well?: string; message: string }[] };
      expect(body.error.replace(/ \(and \d+ more problems?\)$/, "")).toBe(bad.error);
      expect(bad.error.endsWith(body.details[0]!.message)).toBe(true);
      expect(await counts()).toEqual(before);
      expect(await objectExists(sha(bytes))).toBe(false);
    });
  }

  it("an export missing a well the plate map uses is refused, naming the well", async () => {
    const mapId = await mapFor(96);
    const text = fs
      .readFileSync(`${dir}/single-dose-96.long.csv`, "utf8")
      .split("\n")
      .filter((l) => !l.startsWith("A3,"))
      .join("\n");
    const bytes = new TextEncoder().encode(text);
    const before = await counts();
    const r = await postRun(mapId, "missing-a3.csv", bytes);
    expect(r.status).toBe(400);
    expect(r.json).toMatchObject({
      error: "missing-a3.csv, well A3: the plate map has a sample well here but the export has no reading for it",
      details: [{ well: "A3" }],
    });
    expect(await counts()).toEqual(before);
    expect(await objectExists(sha(bytes))).toBe(false);
  });

  it("a file over 25 MB is refused before it is hashed or stored (413)", async () => {
    const big = new Uint8Array(25 * 1024 * 1024 + 1).fill(0x41);
    const before = await counts();
    const e = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
      plateMapId: await mapFor(96),
      fileName: "huge.csv",
      contentType: "text/csv",
      bytes: big,
    }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(AppError);
    expect((e as AppError).status).toBe(413);
    expect((e as AppError).message).toBe("huge.csv: file is 25.0 MB; the limit is 25 MB");
    expect(await counts()).toEqual(before);
    expect(await objectExists(sha(big))).toBe(false);
  });

  it("an upload killed halfway (the readings insert fails) leaves no run, no readings and no stored file", async () => {
    const { id: mapId } = await createPlateMap(w.people.assay, w.campaignId, { name: "Crash test", map: smallMap() });
    // Bytes no other test uploads: the check below is that no run anywhere has them.
    const bytes = smallExport(77_000_000 + Number.parseInt(w.tag.slice(0, 6), 16));
    const before = await counts();
    await db.execute(sql`create or replace function test_fail_reading() returns trigger language plpgsql as $$
      begin if new.well = 'C12' then raise exception 'simulated crash in the middle of the readings insert'; end if; return new; end $$`);
    await db.execute(
      sql`create trigger test_fail_reading before insert on well_readings for each row execute function test_fail_reading()`,
    );
    try {
      const e = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
        plateMapId: mapId,
        fileName: "crash.csv",
        contentType: "text/csv",
        bytes,
      }).catch((x: unknown) => x);
      expect(e).toBeInstanceOf(Error);
      expect(String((e as Error & { cause?: Error }).cause?.message ?? (e as Error).message)).toContain(
        "simulated crash",
      );
    } finally {
      await db.execute(sql`drop trigger test_fail_reading on well_readings`);
      await db.execute(sql`drop function test_fail_reading()`);
    }
    expect(await counts()).toEqual(before);
    expect(
      await db
        .select()
        .from(plateRuns)
        .where(eq(plateRuns.sha256, sha(bytes))),
    ).toEqual([]);
    expect(await objectExists(sha(bytes))).toBe(false);
    // The same file then uploads cleanly.
    const ok = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
      plateMapId: mapId,
      fileName: "crash.csv",
      contentType: "text/csv",
      bytes,
    });
    expect(ok.wells).toBe(24);
  });
});
