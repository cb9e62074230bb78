// Plate runs end to end against the real Postgres and the S3 fake: uploads, QC, previews, the
// stored raw file and duplicates.
// Outside references: a worked example of the Z′ definition (Zhang, Chung & Oldenburg, J Biomol
// Screen 1999;4:67–73) on controls 1000 ± 31.6 and 100 ± 7.07, its figures calculated with SciPy;
// NumPy/SciPy (python3) for the QC of a fixture plate, and Node's crypto for SHA-256 (FIPS 180-4).
// The plates are INVENTED data (fixtures/plates/README.md; test helpers in src/test/plates.ts).
import { describe, it, expect, beforeAll } from "vitest";
import { execFileSync } from "node:child_process";
import { and, eq } from "drizzle-orm";
import { makeWorld, callRoute, type World } from "@/test/harness";
import { campaignRow, registryIds, smallExport, smallMap } from "@/test/plates";
import { bytesOf, counts, dir, form, objectExists, plateRoutes, sha } from "@/test/plate-routes";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { db } from "@/server/db/client";
import { wellReadings } from "@/server/db/schema";
import * as previewRoute from "@/app/api/campaigns/[campaignId]/plate-runs/preview/route";
import * as runRoute from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/route";
import * as fileRoute from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/file/route";
import { createPlateMap, uploadRun } from ".";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
  // The fixture plate maps used here name INH-000001 … INH-000064.
  await ensureCompoundsRegistered(registryIds(64));
});
const { postMap, postRun, mapFor } = plateRoutes(() => w);

describe("plate runs: upload, QC, raw file", () => {
  it("QC figures of the worked Z′ example: Z′ 0.87102, SW 24.79, S/B 10, CV 3.16 % / 7.07 %, 550 → 50 %", async () => {
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
