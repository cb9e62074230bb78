// Committing a bulk import against the real Postgres and the S3 fake: the file stored with its
// SHA-256 before parsing, the per-record problems, all-or-nothing and valid-only commits, the
// report, and structures already registered. Outside references: Node's crypto for SHA-256
// (FIPS 180-4). Caffeine (PubChem CID 2519, structure from memory) stands for a structure already
// registered; every other structure is an INVENTED test molecule.
import { describe, it, expect, beforeAll } from "vitest";
import crypto from "node:crypto";
import { callRoute, makeWorld, type World } from "@/test/harness";
import { compoundApi, counts, type Json } from "@/test/compound-api";
import { uniqueSmiles } from "@/test/compounds";
import { getObject } from "@/server/storage/s3";
import * as reportRoute from "@/app/api/compound-imports/[importId]/report/route";
import { importS3Key } from "@/server/services/compounds";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});
const { upload, commit, registerOrFind } = compoundApi(() => w);

describe("bulk import", () => {
  // Records 3, 6 and 9 are bad: an unclosed ring, a purity over 100 %, an element that does not exist.
  const records = Array.from({ length: 10 }, (_, i) => ({ smiles: uniqueSmiles(), name: `Bulk-${i + 1} (invented)` }));
  records[2]!.smiles = "C1CC(=O)N";
  const csv = [
    "smiles,name,supplier,purity_pct,amount_mg",
    ...records.map((r, i) => `${r.smiles},${r.name},Invented Supplier,${i === 5 ? "150" : "99"},5`),
  ]
    .join("\n")
    .replace(/^(.*Bulk-9 .*)$/m, (line) => `Xq${line}`);

  it("stores the file with its SHA-256 before parsing, and reports exactly the three bad records", async () => {
    const { id, view } = await upload("three-bad.csv", csv);
    expect(view.status).toBe("ready");
    expect(view.sha256).toBe(crypto.createHash("sha256").update(csv).digest("hex"));
    expect(new TextDecoder().decode(await getObject(importS3Key(view.sha256 as string)))).toBe(csv);
    const p = view.preview as {
      invalidRecords: number[];
      valid: number;
      totalRecords: number;
      issues: { record: number; line: number; field: string; message: string }[];
    };
    expect(p.totalRecords).toBe(10);
    expect(p.invalidRecords).toEqual([3, 6, 9]);
    expect(p.valid).toBe(7);
    const byRecord = Object.fromEntries(p.issues.map((i) => [i.record, i]));
    expect(byRecord[3]).toMatchObject({ line: 4, field: "smiles" });
    expect(byRecord[3]!.message).toMatch(/unclosed ring/);
    expect(byRecord[6]).toMatchObject({ line: 7 });
    expect(byRecord[6]!.message).toContain("Purity (%) must be between 0 and 100");
    expect(byRecord[9]).toMatchObject({ line: 10, field: "smiles" });

    // All or nothing: refused, and nothing is written.
    const before = await counts();
    const r = await commit(id, "all_or_nothing");
    expect(r.status).toBe(400);
    expect((r.json as Json).error).toMatch(
      /^3 of 10 records cannot be registered \(records 3, 6, 9\)\. In all-or-nothing mode nothing was registered/,
    );
    expect(await counts()).toEqual(before);

    // Valid records only: the other seven, with their batches, in one go.
    const ok = await commit(id, "valid_only");
    expect(ok.status).toBe(200);
    expect((ok.json as Json).result).toMatchObject({ mode: "valid_only", registered: 7, notRegistered: 3 });
    const after = await counts();
    expect(after.c - before.c).toBe(7);
    expect(after.b - before.b).toBe(7);

    const report = await callRoute(reportRoute.GET, {
      user: w.people.chemist, // the uploader (others get 404: registry.int.test.ts)
      path: `/api/compound-imports/${id}/report`,
      params: { importId: id },
    });
    const lines = (report.json as string).trim().split("\r\n");
    expect(lines[0]).toBe("record,line,outcome,registry_id,name,field,reason");
    expect(lines.filter((l) => /,registered,INH-\d{6},/.test(l))).toHaveLength(7);
    expect(lines.filter((l) => l.includes(",not registered,")).map((l) => Number(l.split(",")[0]))).toEqual([3, 6, 9]);
    expect(report.response.headers.get("content-disposition")).toContain("three-bad-report.csv");

    // A second commit is refused.
    expect((await commit(id, "valid_only")).status).toBe(409);
  });

  it("registers a clean file in all-or-nothing mode, and refuses structures already registered", async () => {
    const existing = await registerOrFind("Cn1cnc2c1c(=O)n(C)c(=O)n2C");
    const clean = [
      "smiles,name,stock_concentration_mm,stock_solvent",
      `${uniqueSmiles()},Clean-1 (invented),10,DMSO`,
      `${uniqueSmiles()},Clean-2 (invented),10,DMSO`,
    ].join("\n");
    const { id } = await upload("clean.csv", clean);
    const before = await counts();
    const r = await commit(id, "all_or_nothing");
    expect(r.status).toBe(200);
    const after = await counts();
    expect([after.c - before.c, after.b - before.b, after.s - before.s]).toEqual([2, 2, 2]);

    const again = await upload("with-duplicate.csv", `smiles\nCN1C=NC2=C1C(=O)N(C)C(=O)N2C\n`);
    const p = again.view.preview as { issues: { message: string }[] };
    expect(p.issues[0]!.message).toBe(
      `Already registered as ${existing.registryId}; add a batch to ${existing.registryId} instead.`,
    );
  });
});
