// Plates end to end against the real Postgres and the S3 fake: plate maps, uploads, QC, masks,
// decisions, and every bad input with its exact message and nothing written.
// Outside references: the worked example of science.md "Plate quality and normalisation"
// (Z′: Zhang, Chung & Oldenburg, J Biomol Screen 1999;4:67–73; figures [calc] with SciPy),
// NumPy/SciPy (python3) for the QC of a fixture plate, and Node's crypto for SHA-256 (FIPS 180-4).
// The plates are INVENTED data (fixtures/plates/README.md; test helpers in src/test/plates.ts).
import { describe, it, expect, beforeAll } from "vitest";
import crypto from "node:crypto";
import fs from "node:fs";
import { execFileSync } from "node:child_process";
import { and, eq, sql } from "drizzle-orm";
import { makeWorld, callRoute, type World } from "@/test/harness";
import { campaignRow, registryIds, smallExport, smallMap } from "@/test/plates";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { db } from "@/server/db/client";
import { auditLog, plateMaps, plateRuns, plateWellMasks, wellReadings } from "@/server/db/schema";
import { getObject } from "@/server/storage/s3";
import { AppError } from "@/server/errors";
import * as plateMapsRoute from "@/app/api/campaigns/[campaignId]/plate-maps/route";
import * as plateRunsRoute from "@/app/api/campaigns/[campaignId]/plate-runs/route";
import * as previewRoute from "@/app/api/campaigns/[campaignId]/plate-runs/preview/route";
import * as runRoute from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/route";
import * as fileRoute from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/file/route";
import { createPlateMap, decideRun, maskWell, s3KeyFor, unmaskWell, updatePlateMap, uploadRun } from "./plates";
import { plateMapToCsv } from "@/lib/plates";

const dir = "fixtures/plates";
type Truth = {
  good: { file: string; map: string; format: number; shape: string; reads: number; wells: number }[];
  bad: { file: string; parseAs: "reader-export" | "plate-map"; format?: number; case: string; error: string }[];
};
const truth = JSON.parse(fs.readFileSync(`${dir}/truth.json`, "utf8")) as Truth;

let w: World;
beforeAll(async () => {
  w = await makeWorld();
  // The fixture plate maps used here name INH-000001 … INH-000064.
  await ensureCompoundsRegistered(registryIds(64));
});

const sha = (b: Uint8Array) => crypto.createHash("sha256").update(b).digest("hex");
const bytesOf = (p: string) => new Uint8Array(fs.readFileSync(p));

function form(fields: Record<string, string>, file?: { name: string; bytes: Uint8Array; type?: string }): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.append(k, v);
  if (file) f.append("file", new File([new Uint8Array(file.bytes)], file.name, { type: file.type ?? "text/csv" }));
  return f;
}

async function postMap(name: string, format: number, csv: Uint8Array, fileName = "map.csv") {
  return callRoute(plateMapsRoute.POST, {
    user: w.people.assay,
    method: "POST",
    path: `/api/campaigns/${w.campaignId}/plate-maps`,
    params: { campaignId: w.campaignId },
    body: form({ name, format: String(format) }, { name: fileName, bytes: csv }),
  });
}

async function postRun(plateMapId: string, name: string, bytes: Uint8Array, extra: Record<string, string> = {}) {
  return callRoute(plateRunsRoute.POST, {
    user: w.people.assay,
    method: "POST",
    path: `/api/campaigns/${w.campaignId}/plate-runs`,
    params: { campaignId: w.campaignId },
    body: form({ plateMapId, ...extra }, { name, bytes }),
  });
}

async function counts() {
  const [r] = await db.execute<{ runs: number; readings: number; maps: number }>(sql`
    select (select count(*)::int from plate_runs) as runs, (select count(*)::int from well_readings) as readings, (select count(*)::int from plate_maps) as maps`);
  return r!;
}

async function objectExists(sha256: string): Promise<boolean> {
  return getObject(s3KeyFor(sha256)).then(
    () => true,
    () => false,
  );
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

  it("refuses a second plate map with the same name (409)", async () => {
    const r = await postMap("Fixture map 96", 96, bytesOf(`${dir}/single-dose-96.map.csv`));
    expect(r.status).toBe(409);
  });
});

describe("plate runs: upload, QC, raw file", () => {
  it("QC figures of the science.md worked example: Z′ 0.87102, SW 24.79, S/B 10, CV 3.16 % / 7.07 %, 550 → 50 %", async () => {
    const { id: mapId } = await createPlateMap(w.people.assay, w.campaignId, {
      name: "Worked example",
      map: smallMap(),
    });
    const run = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
      plateMapId: mapId,
      fileName: "worked.csv",
      contentType: "text/csv",
      bytes: smallExport(1),
    });
    expect(run.qc.zPrime).toBeCloseTo(0.87102, 5);
    expect(run.qc.signalWindow).toBeCloseTo(24.79, 2);
    expect(run.qc.signalToBackground).toBeCloseTo(10, 10);
    expect(run.qc.cvNeutralPct).toBeCloseTo(3.16, 2);
    expect(run.qc.cvFullPct).toBeCloseTo(7.07, 2);
    expect(run.qc.verdict).toBe("pass");
    const [c1] = await db
      .select()
      .from(wellReadings)
      .where(and(eq(wellReadings.runId, run.id), eq(wellReadings.well, "C1")));
    expect(c1!.inhibitionPct).toBeCloseTo(50, 10);
    expect(c1!.compoundId).toBe("INH-000001");
    expect(c1!.concentrationUm).toBe(10);
  });

  let fixtureRunId = "";
  const fixtureBytes = bytesOf(`${dir}/single-dose-96.long.csv`);

  it("uploads a fixture through the API: 201 with the documented shape, the raw file stored first, QC as NumPy computes it", async () => {
    const mapId = await mapFor(96);
    const r = await postRun(mapId, "single-dose-96.long.csv", fixtureBytes, { barcode: "INV-0001" });
    expect(r.status).toBe(201);
    const body = r.json as {
      id: string;
      sha256: string;
      wells: number;
      reads: number;
      qc: Record<string, number | string>;
    };
    fixtureRunId = body.id;
    expect(body.sha256).toBe(sha(fixtureBytes));
    expect(body.wells).toBe(96);
    expect(body.reads).toBe(1);
    expect(Object.keys(body.qc).sort()).toEqual([
      "cvFullPct",
      "cvNeutralPct",
      "signalToBackground",
      "signalWindow",
      "verdict",
      "zPrime",
    ]);
    expect(await objectExists(body.sha256)).toBe(true);
    const ctrl = await db
      .select({ role: wellReadings.role, signal: wellReadings.signal })
      .from(wellReadings)
      .where(eq(wellReadings.runId, body.id));
    const n = ctrl.filter((x) => x.role === "neutral").map((x) => x.signal);
    const f = ctrl.filter((x) => x.role === "full").map((x) => x.signal);
    const py = execFileSync(
      "python3",
      [
        "-c",
        "import json,sys,numpy as np;a,b=map(np.array,json.load(sys.stdin));sa,sb=a.std(ddof=1),b.std(ddof=1);print(json.dumps([1-3*(sa+sb)/abs(a.mean()-b.mean()),a.mean()/b.mean(),(abs(a.mean()-b.mean())-3*(sa+sb))/sa]))",
      ],
      { input: JSON.stringify([n, f]) },
    ).toString();
    const [z, sb, sw] = JSON.parse(py) as number[];
    expect(body.qc.zPrime as number).toBeCloseTo(z!, 10);
    expect(body.qc.signalToBackground as number).toBeCloseTo(sb!, 10);
    expect(body.qc.signalWindow as number).toBeCloseTo(sw!, 10);
  });

  it("GET the run answers its QC and every well's value and % inhibition; the raw file downloads byte for byte", async () => {
    const r = await callRoute(runRoute.GET, {
      user: w.people.viewer,
      path: "/x",
      params: { campaignId: w.campaignId, runId: fixtureRunId },
    });
    expect(r.status).toBe(200);
    const body = r.json as {
      readings: { well: string; value: number; inhibitionPct: number | null; role: string }[];
      file: { sha256: string };
      barcode: string;
    };
    expect(body.readings).toHaveLength(96);
    expect(body.barcode).toBe("INV-0001");
    expect(body.readings.filter((x) => x.role === "sample").every((x) => typeof x.inhibitionPct === "number")).toBe(
      true,
    );
    const f = await callRoute(fileRoute.GET, {
      user: w.people.viewer,
      path: "/x",
      params: { campaignId: w.campaignId, runId: fixtureRunId },
    });
    expect(f.status).toBe(200);
    const got = new Uint8Array(await f.response.arrayBuffer());
    expect(sha(got)).toBe(sha(fixtureBytes));
    expect(f.response.headers.get("x-content-sha256")).toBe(sha(fixtureBytes));
    expect(f.response.headers.get("content-disposition")).toContain('filename="single-dose-96.long.csv"');
  });

  it("the same file again → 409 with the earlier run's id, and nothing new", async () => {
    const before = await counts();
    const r = await postRun(await mapFor(96), "renamed-copy.csv", fixtureBytes);
    expect(r.status).toBe(409);
    expect((r.json as { runId: string }).runId).toBe(fixtureRunId);
    expect(await counts()).toEqual(before);
    expect(await objectExists(sha(fixtureBytes))).toBe(true); // the earlier run's file stays
  });

  it("a kinetic export becomes initial rates with R² and a linearity flag, and keeps the series for display", async () => {
    const m = await postMap("Mechanism 96", 96, bytesOf(`${dir}/mechanism-96.map.csv`));
    expect(m.status).toBe(201);
    const mapIdStr = (m.json as { id: string }).id;
    const r = await postRun(mapIdStr, "mechanism-96.long-kinetic.csv", bytesOf(`${dir}/mechanism-96.long-kinetic.csv`));
    expect(r.status).toBe(201);
    const body = r.json as { id: string; reads: number; wells: number };
    expect(body.reads).toBe(31);
    const rows = await db.select().from(wellReadings).where(eq(wellReadings.runId, body.id));
    const sample = rows.find((x) => x.role === "sample")!;
    expect(sample.value).toBeNull();
    expect(sample.rateSignalPerS).not.toBeNull();
    expect(sample.rateRSquared).toBeGreaterThan(0.9);
    expect(typeof sample.rateLinear).toBe("boolean");
    expect(sample.series!.timesS).toHaveLength(31);
    expect(sample.signal).toBe(sample.rateSignalPerS);
  });

  it("a preview parses and reports without storing anything", async () => {
    const before = await counts();
    const bytes = bytesOf(`${dir}/single-dose-96.grid.csv`);
    const r = await callRoute(previewRoute.POST, {
      user: w.people.assay,
      method: "POST",
      path: "/x",
      params: { campaignId: w.campaignId },
      body: form({ plateMapId: await mapFor(96) }, { name: "single-dose-96.grid.csv", bytes }),
    });
    expect(r.status).toBe(200);
    expect(r.json).toMatchObject({
      preview: { shape: "grid-endpoint", format: 96, wells: 96 },
      readout: "endpoint",
      qc: { verdict: "pass" },
    });
    expect(await counts()).toEqual(before);
    expect(await objectExists(sha(bytes))).toBe(false);
  });
});

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
    const bytes = smallExport(77);
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

describe("QC verdicts, masks and decisions", () => {
  it("a run whose controls are swapped fails QC and cannot be accepted", async () => {
    const { id: mapId } = await createPlateMap(w.people.assay, w.campaignId, {
      name: "Swapped controls",
      map: smallMap(true),
    });
    const run = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
      plateMapId: mapId,
      fileName: "swapped.csv",
      contentType: "text/csv",
      bytes: smallExport(5),
    });
    expect(run.qc.zPrime).toBeCloseTo(0.87102, 5); // Z′ alone cannot see it
    expect(run.qc.verdict).toBe("fail");
    const e = await decideRun(w.people.assay, w.campaignId, run.id, "accepted", "looks fine").catch((x: unknown) => x);
    expect((e as AppError).status).toBe(409);
    await decideRun(w.people.assay, w.campaignId, run.id, "rejected", "controls swapped at dispensing");
    const [row] = await db.select().from(plateRuns).where(eq(plateRuns.id, run.id));
    expect(row!.decision).toBe("rejected");
    const a = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, run.id), eq(auditLog.action, "plate_run.reject")));
    expect(a[0]!.reason).toBe("controls swapped at dispensing");
  });

  it("masking recomputes QC and % inhibition in one transaction, is audited, and unmasking keeps the history", async () => {
    const { id: mapId } = await createPlateMap(w.people.assay, w.campaignId, { name: "Mask test", map: smallMap() });
    const run = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
      plateMapId: mapId,
      fileName: "mask.csv",
      contentType: "text/csv",
      bytes: smallExport(9),
    });
    const qc = await maskWell(w.people.assay, w.campaignId, run.id, "A03", "pipetting error noted at set-up");
    // Without 1040 the neutral mean is (950+1010+980+1020+1000)/5 = 992.
    expect(qc.neutral!.mean).toBeCloseTo(992, 10);
    expect(qc.maskedWells).toBe(1);
    const [c1] = await db
      .select()
      .from(wellReadings)
      .where(and(eq(wellReadings.runId, run.id), eq(wellReadings.well, "C1")));
    expect(c1!.inhibitionPct).toBeCloseTo((100 * (992 - 550)) / (992 - 100), 10);
    const [a3] = await db
      .select()
      .from(wellReadings)
      .where(and(eq(wellReadings.runId, run.id), eq(wellReadings.well, "A3")));
    expect(a3!.masked).toBe(true);
    expect(
      ((await maskWell(w.people.assay, w.campaignId, run.id, "A3", "again").catch((x: unknown) => x)) as AppError)
        .status,
    ).toBe(409);
    await unmaskWell(w.people.assay, w.campaignId, run.id, "A3", "error was in another plate");
    const masks = await db.select().from(plateWellMasks).where(eq(plateWellMasks.runId, run.id));
    expect(masks).toHaveLength(1);
    expect(masks[0]!.unmaskedAt).not.toBeNull();
    expect(masks[0]!.unmaskReason).toBe("error was in another plate");
    const [again] = await db.select().from(plateRuns).where(eq(plateRuns.id, run.id));
    expect(again!.zPrime).toBeCloseTo(0.87102, 5);
    const acts = await db
      .select({ action: auditLog.action, reason: auditLog.reason })
      .from(auditLog)
      .where(eq(auditLog.entityId, run.id));
    expect(acts.map((x) => x.action).sort()).toEqual(["plate_run.mask", "plate_run.unmask", "plate_run.upload"]);
    await decideRun(w.people.assay, w.campaignId, run.id, "accepted", "QC passes; controls look normal");
    const [decided] = await db.select().from(plateRuns).where(eq(plateRuns.id, run.id));
    expect(decided!.decision).toBe("accepted");
  });

  it("a mask without a reason is refused", async () => {
    const [run] = await db
      .select({ id: plateRuns.id })
      .from(plateRuns)
      .where(eq(plateRuns.campaignId, w.campaignId))
      .limit(1);
    const e = (await maskWell(w.people.assay, w.campaignId, run!.id, "A1", " ").catch((x: unknown) => x)) as AppError;
    expect(e.status).toBe(400);
    expect(e.message).toBe("Give a reason for masking a well (at least 3 characters).");
  });

  it("another campaign's run answers 404", async () => {
    const [run] = await db
      .select({ id: plateRuns.id })
      .from(plateRuns)
      .where(eq(plateRuns.campaignId, w.campaignId))
      .limit(1);
    const r = await callRoute(runRoute.GET, {
      user: w.people.nonMember,
      path: "/x",
      params: { campaignId: w.otherCampaignId, runId: run!.id },
    });
    expect(r.status).toBe(404);
  });
});
