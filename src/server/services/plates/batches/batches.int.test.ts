// A day's plates in one upload, against the real Postgres and the S3 fake: a zip with a manifest,
// plate maps matched by manifest, file name and header barcode, one duplicate, one bad and one
// unmatched file that do not stop the others, accept-all-that-pass, assigning an unmatched file,
// and zips refused before extraction (path traversal, a zip bomb by ratio).
// Outside references: the worked Z′ example (Zhang, Chung & Oldenburg, J Biomol Screen
// 1999;4:67–73) on controls 1000 ± 31.6 and 100 ± 7.07 → Z′ 0.87102 (as in upload.int.test.ts,
// calculated with SciPy); Node's crypto for SHA-256 (FIPS 180-4); jszip (a general-purpose zip
// library) writes the archives. The plates are INVENTED data (src/test/plates.ts).
import { describe, it, expect, beforeAll } from "vitest";
import crypto from "node:crypto";
import JSZip from "jszip";
import { and, eq } from "drizzle-orm";
import { makeWorld, callRoute, type World } from "@/test/harness";
import { campaignRow, registryIds, smallExport, smallMap, FULL } from "@/test/plates";
import { ensureCompoundsRegistered } from "@/test/compounds";
import { db } from "@/server/db/client";
import { auditLog, plateBatches, plateBatchFiles, plateRuns } from "@/server/db/schema";
import { headObjectSha256 } from "@/server/storage/s3";
import * as batchesRoute from "@/app/api/campaigns/[campaignId]/plate-batches/route";
import * as batchRoute from "@/app/api/campaigns/[campaignId]/plate-batches/[batchId]/route";
import * as assignRoute from "@/app/api/campaigns/[campaignId]/plate-batches/[batchId]/files/[fileId]/assign/route";
import * as acceptRoute from "@/app/api/campaigns/[campaignId]/plate-batches/[batchId]/accept-passing/route";
import { createPlateMap, uploadRun } from "..";
import type { BatchView } from ".";

let w: World;
let mapA: string;
let mapB: string;
const enc = new TextEncoder();
const sha = (b: Uint8Array) => crypto.createHash("sha256").update(b).digest("hex");

/** Noisy neutral controls (CV about 35 %): QC fails on control CV. INVENTED. */
function failingExport(): Uint8Array {
  const neutral = [500, 1500, 700, 1300, 900, 1100];
  const lines = ["well,value", ...neutral.map((v, i) => `A${i + 1},${v}`), ...FULL.map((v, i) => `B${i + 1},${v}`)];
  for (let c = 1; c <= 12; c++) lines.push(`C${c},${900 + c}`);
  return enc.encode(lines.join("\n") + "\n");
}

async function zipOf(entries: Record<string, Uint8Array | string>): Promise<Uint8Array> {
  const z = new JSZip();
  for (const [n, b] of Object.entries(entries)) z.file(n, b);
  return z.generateAsync({ type: "uint8array", compression: "DEFLATE" });
}

function batchForm(files: { name: string; bytes: Uint8Array }[], manifest?: string): FormData {
  const f = new FormData();
  for (const x of files) f.append("file", new File([x.bytes as Uint8Array<ArrayBuffer>], x.name));
  if (manifest) f.append("manifest", new File([manifest], "manifest.csv", { type: "text/csv" }));
  return f;
}

async function post(form: FormData, wait = true) {
  const res = await callRoute(batchesRoute.POST, {
    user: w.people.assay,
    method: "POST",
    path: `/api/campaigns/${w.campaignId}/plate-batches${wait ? "?wait=true" : ""}`,
    params: { campaignId: w.campaignId },
    body: form,
  });
  return { status: res.status, body: res.json as BatchView & { error?: string } };
}

beforeAll(async () => {
  w = await makeWorld();
  await ensureCompoundsRegistered(registryIds(12));
  mapA = (await createPlateMap(w.people.assay, w.campaignId, { name: "DAY-A", map: smallMap() })).id;
  mapB = (await createPlateMap(w.people.assay, w.campaignId, { name: "DAY-B", map: smallMap() })).id;
});

describe("plate batches", () => {
  let view: BatchView;
  const early = smallExport(7001);

  it("a zip of six files: each stored with its SHA-256 and parsed on its own; bad, duplicate and unmatched ones reported", async () => {
    const earlier = await uploadRun(w.people.assay, await campaignRow(w.campaignId), {
      plateMapId: mapA,
      fileName: "yesterday.csv",
      contentType: "text/csv",
      bytes: early,
    });
    const files = {
      "day/DAY-A_p01.csv": smallExport(7002), // by file name
      "day/p02.csv": smallExport(7003), // by manifest
      "day/p03.csv": enc.encode("Barcode: DAY-B\n" + new TextDecoder().decode(smallExport(7004))), // by header
      "day/DAY-A_p04.csv": early, // the same bytes as yesterday's run
      "day/DAY-A_p05.csv": enc.encode("this is not a reader export\n"), // refused
      "day/mystery.csv": smallExport(7005), // unmatched
      "day/DAY-B_p06.csv": failingExport(), // stored, fails QC
    };
    const zip = await zipOf(files);
    const { status, body } = await post(
      batchForm([{ name: "day.zip", bytes: zip }], "file_name,barcode,plate_map\np02.csv,BC-0002,DAY-B\n"),
    );
    expect(status, JSON.stringify(body)).toBe(201);
    view = body;
    expect(view.status).toBe("done");
    const by = Object.fromEntries(view.files.map((f) => [f.fileName, f]));
    expect(by["DAY-A_p01.csv"]).toMatchObject({ outcome: "stored", plateMapId: mapA, matchedBy: "file name" });
    expect(by["p02.csv"]).toMatchObject({
      outcome: "stored",
      plateMapId: mapB,
      matchedBy: "manifest",
      barcode: "BC-0002",
    });
    expect(by["p03.csv"]).toMatchObject({
      outcome: "stored",
      plateMapId: mapB,
      matchedBy: "barcode",
      barcode: "DAY-B",
    });
    expect(by["DAY-A_p04.csv"]).toMatchObject({ outcome: "duplicate", existingRunId: earlier.id });
    expect(by["DAY-A_p05.csv"]!.outcome).toBe("refused");
    expect(by["DAY-A_p05.csv"]!.message).toMatch(/DAY-A_p05\.csv/);
    expect(by["mystery.csv"]).toMatchObject({ outcome: "unmatched", plateMapId: null, runId: null });
    expect(by["DAY-B_p06.csv"]!.run).toMatchObject({ verdict: "fail" });
    // Worked Z′ example (Zhang et al. 1999): 0.87102; S/B 10; CV 3.16 % and 7.07 %.
    expect(by["DAY-A_p01.csv"]!.run!.zPrime).toBeCloseTo(0.87102, 5);
    expect(by["DAY-A_p01.csv"]!.run!.signalToBackground).toBeCloseTo(10, 10);
    expect(by["DAY-A_p01.csv"]!.run!.cvNeutralPct).toBeCloseTo(3.16, 2);
    expect(view.counts).toMatchObject({
      total: 7,
      stored: 4,
      duplicate: 1,
      refused: 1,
      unmatched: 1,
      pass: 3,
      fail: 1,
    });
    // Every file's bytes are in the object store under their SHA-256 (FIPS 180-4, Node's crypto).
    for (const [name, bytes] of Object.entries(files)) {
      const f = by[name.split("/").pop()!]!;
      expect(f.sha256).toBe(sha(bytes));
      expect(await headObjectSha256(`plate-batches/sha256/${f.sha256}`)).toBe(f.sha256);
    }
  });

  it("GET gives the same outcomes to a viewer; another campaign's batch is 404", async () => {
    const res = await callRoute(batchRoute.GET, {
      user: w.people.viewer,
      path: `/api/campaigns/${w.campaignId}/plate-batches/${view.id}`,
      params: { campaignId: w.campaignId, batchId: view.id },
    });
    expect(res.status).toBe(200);
    expect((res.json as BatchView).files.map((f) => f.outcome)).toEqual(view.files.map((f) => f.outcome));
    const other = await makeWorld();
    const res2 = await callRoute(batchRoute.GET, {
      user: other.people.admin,
      path: `/api/campaigns/${other.campaignId}/plate-batches/${view.id}`,
      params: { campaignId: other.campaignId, batchId: view.id },
    });
    expect(res2.status).toBe(404);
  });

  it("accept all that pass: the three passing runs accepted with one reason and audited; the failing one left", async () => {
    const res = await callRoute(acceptRoute.POST, {
      user: w.people.assay,
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/plate-batches/${view.id}/accept-passing`,
      params: { campaignId: w.campaignId, batchId: view.id },
      body: { reason: "Controls within limits (day review)" },
    });
    expect(res.status).toBe(200);
    const body = res.json as { accepted: string[]; failing: number; alreadyDecided: number };
    expect(body.accepted).toHaveLength(3);
    expect(body.failing).toBe(1);
    const runs = await db.select().from(plateRuns).where(eq(plateRuns.campaignId, w.campaignId));
    const failing = view.files.find((f) => f.fileName === "DAY-B_p06.csv")!.runId!;
    expect(runs.find((r) => r.id === failing)!.decision).toBe("pending");
    for (const id of body.accepted) {
      expect(runs.find((r) => r.id === id)!.decisionReason).toBe("Controls within limits (day review)");
      const a = await db
        .select()
        .from(auditLog)
        .where(and(eq(auditLog.entityId, id), eq(auditLog.action, "plate_run.accept")));
      expect(a).toHaveLength(1);
    }
    // Again: nothing new, three already decided.
    const again = await callRoute(acceptRoute.POST, {
      user: w.people.assay,
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/plate-batches/${view.id}/accept-passing`,
      params: { campaignId: w.campaignId, batchId: view.id },
      body: { reason: "again" },
    });
    expect(again.json).toMatchObject({ accepted: [], failing: 1, alreadyDecided: 3 });
  });

  it("an unmatched file is assigned a plate map and stored; assigning it again is a 409", async () => {
    const file = view.files.find((f) => f.outcome === "unmatched")!;
    const call = () =>
      callRoute(assignRoute.POST, {
        user: w.people.assay,
        method: "POST",
        path: `/api/campaigns/${w.campaignId}/plate-batches/${view.id}/files/${file.id}/assign`,
        params: { campaignId: w.campaignId, batchId: view.id, fileId: file.id },
        body: { plateMapId: mapA },
      });
    const res = await call();
    expect(res.status).toBe(200);
    const body = res.json as { outcome: string; runId: string };
    expect(body.outcome).toBe("stored");
    const [run] = await db.select().from(plateRuns).where(eq(plateRuns.id, body.runId));
    expect(run!.sha256).toBe(file.sha256);
    expect((await call()).status).toBe(409);
  });

  it("zips refused before extraction leave no batch: a path with '..', and a zip bomb by ratio", async () => {
    const before = (await db.select().from(plateBatches).where(eq(plateBatches.campaignId, w.campaignId))).length;
    const z = new JSZip();
    z.file("../../etc/evil.csv", smallExport(7100));
    const traversal = await z.generateAsync({ type: "uint8array", compression: "DEFLATE" });
    const r1 = await post(batchForm([{ name: "evil.zip", bytes: traversal }]));
    expect(r1.status).toBe(400);
    expect(r1.body.error).toMatch(/evil\.zip: entry "\.\.\/\.\.\/etc\/evil\.csv" has an unsafe path/);
    const bomb = await zipOf({ "zeros.csv": new Uint8Array(20 * 1024 * 1024) });
    const r2 = await post(batchForm([{ name: "bomb.zip", bytes: bomb }]));
    expect(r2.status).toBe(400);
    expect(r2.body.error).toMatch(/bomb\.zip: the archive inflates \d+× its size/);
    const after = (await db.select().from(plateBatches).where(eq(plateBatches.campaignId, w.campaignId))).length;
    expect(after).toBe(before);
  });

  it("without waiting: 202 with the files pending or done, then every file reaches its outcome", async () => {
    const { status, body } = await post(
      batchForm([
        { name: "DAY-A_n1.csv", bytes: smallExport(7201) },
        { name: "DAY-A_n2.csv", bytes: smallExport(7202) },
      ]),
      false,
    );
    expect(status).toBe(202);
    expect(body.files).toHaveLength(2);
    for (let i = 0; i < 100; i++) {
      const rows = await db.select().from(plateBatchFiles).where(eq(plateBatchFiles.batchId, body.id));
      if (rows.every((r) => r.outcome !== "pending")) {
        expect(rows.map((r) => r.outcome)).toEqual(["stored", "stored"]);
        return;
      }
      await new Promise((r) => setTimeout(r, 100));
    }
    throw new Error("the batch did not finish in 10 s");
  });
});
