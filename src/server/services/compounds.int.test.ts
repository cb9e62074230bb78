// The compound registry end to end against the real Postgres and the S3 fake: registration
// through the JSON API, duplicates, stereo forms, salts, bulk import in both modes, search,
// libraries and the audit of structure edits.
// Outside references: PubChem compound records for aspirin (CID 2244), caffeine (CID 2519) and
// ibuprofen (CID 3672) — molecular formula and molecular weight, quoted from memory (no internet
// here), with MW re-derived in python3 from the formula and standard atomic weights (IUPAC
// conventional values C 12.011, H 1.008, N 14.007, O 15.999), which agree to 0.01 g/mol.
// Node's crypto for SHA-256 (FIPS 180-4). Other structures here are INVENTED test molecules.
import { describe, it, expect, beforeAll } from "vitest";
import crypto from "node:crypto";
import ExcelJS from "exceljs";
import { Molecule } from "openchemlib";
import { execFileSync } from "node:child_process";
import { and, eq, sql } from "drizzle-orm";
import { makeWorld, callRoute, type World } from "@/test/harness";
import { uniqueSmiles } from "@/test/compounds";
import { db } from "@/server/db/client";
import { analyses, auditLog, compoundLibraries, compoundResults, compounds, experiments } from "@/server/db/schema";
import { getObject } from "@/server/storage/s3";
import * as compoundsRoute from "@/app/api/compounds/route";
import * as compoundRoute from "@/app/api/compounds/[registryId]/route";
import * as importsRoute from "@/app/api/compound-imports/route";
import * as importRoute from "@/app/api/compound-imports/[importId]/route";
import * as commitRoute from "@/app/api/compound-imports/[importId]/commit/route";
import * as reportRoute from "@/app/api/compound-imports/[importId]/report/route";
import { addBatch, createLibrary, editCompound, getCompound, resultsForCompound, searchCompounds } from "./compounds";
import { importS3Key, waitForImport } from "./compound-imports";
import { AppError } from "@/server/errors";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});

type Json = Record<string, unknown>;
const post = (body: unknown, who: "chemist" | "admin" = "chemist") =>
  callRoute(compoundsRoute.POST, { user: w.people[who], method: "POST", path: "/api/compounds", body });
const getOne = (registryId: string) =>
  callRoute(compoundRoute.GET, { user: w.people.viewer, path: `/api/compounds/${registryId}`, params: { registryId } });
const search = (qs: string) => callRoute(compoundsRoute.GET, { user: w.people.viewer, path: `/api/compounds?${qs}` });

/** Registers, or finds the registry ID when an earlier test file registered the same structure. */
async function registerOrFind(
  smiles: string,
  name?: string,
): Promise<{ registryId: string; created: boolean; json: Json }> {
  const r = await post({ smiles, name });
  if (r.status === 201)
    return { registryId: (r.json as Json).registryId as string, created: true, json: r.json as Json };
  expect(r.status).toBe(409);
  return { registryId: (r.json as Json).registryId as string, created: false, json: r.json as Json };
}

/** MW from the formula with standard atomic weights, computed by python3 (outside the project's code). */
function pythonMw(formula: string): number {
  const script = `
import re,sys
w={'C':12.011,'H':1.008,'N':14.007,'O':15.999}
print(sum(w[e]*(int(n) if n else 1) for e,n in re.findall(r'([A-Z][a-z]?)(\\d*)',sys.argv[1])))`;
  return Number(execFileSync("python3", ["-c", script, formula]).toString().trim());
}

const counts = async () => {
  const [r] = await db.execute<{ c: number; b: number; s: number }>(
    sql`select (select count(*)::int from compounds) as c, (select count(*)::int from compound_batches) as b, (select count(*)::int from stock_solutions) as s`,
  );
  return r!;
};

describe("registering through POST /api/compounds", () => {
  // PubChem (from memory): aspirin C9H8O4 180.16 g/mol; caffeine C8H10N4O2 194.19; ibuprofen C13H18O2 206.28.
  const publicMolecules = [
    { name: "aspirin", smiles: "CC(=O)Oc1ccccc1C(=O)O", formula: "C9H8O4", mw: 180.16, heavyAtoms: 13 },
    { name: "caffeine", smiles: "Cn1cnc2c1c(=O)n(C)c(=O)n2C", formula: "C8H10N4O2", mw: 194.19, heavyAtoms: 14 },
    { name: "ibuprofen", smiles: "CC(C)Cc1ccc(cc1)C(C)C(=O)O", formula: "C13H18O2", mw: 206.28, heavyAtoms: 15 },
  ];
  for (const m of publicMolecules) {
    it(`gives ${m.name} the formula and molecular weight of its PubChem record`, async () => {
      const { registryId, created, json } = await registerOrFind(m.smiles, `${m.name} (public reference molecule)`);
      expect(registryId).toMatch(/^INH-\d{6}$/);
      const detail = (await getOne(registryId)).json as Json;
      for (const body of created ? [json, detail] : [detail]) {
        expect(body.formula).toBe(m.formula);
        expect(body.mw as number).toBeCloseTo(m.mw, 1);
        expect(body.heavyAtoms).toBe(m.heavyAtoms);
      }
      expect(Math.abs(pythonMw(m.formula) - m.mw)).toBeLessThan(0.01);
      expect(detail.units).toMatchObject({ mw: "g/mol", tpsa: "Å²" });
    });
  }

  it("answers 400 naming the problem for a structure that cannot be read, and writes nothing", async () => {
    const before = await counts();
    const r = await post({ smiles: "C1CCC" });
    expect(r.status).toBe(400);
    expect((r.json as Json).error).toMatch(/unclosed ring: ring bond 1 is opened but never closed/);
    const r2 = await post({ smiles: "CC(C)(C)(C)(C)C" });
    expect(r2.status).toBe(400);
    expect((r2.json as Json).error).toMatch(/more bonds than its valence allows/);
    const r3 = await post({ name: "no structure" });
    expect(r3.status).toBe(400);
    expect((r3.json as Json).error).toMatch(/Give a structure: a SMILES or a molfile/);
    expect(await counts()).toEqual(before);
  });

  it("answers 409 with the existing registry ID for the same structure written differently", async () => {
    const { registryId } = await registerOrFind("CC(=O)Oc1ccccc1C(=O)O");
    const before = await counts();
    const r = await post({ smiles: "OC(=O)c1ccccc1OC(C)=O", name: "aspirin again" });
    expect(r.status).toBe(409);
    expect((r.json as Json).registryId).toBe(registryId);
    expect((r.json as Json).error).toContain(`Add a new batch to ${registryId}`);
    expect(await counts()).toEqual(before);
  });

  it("asks for a reason before registering another stereo form, then registers it", async () => {
    await registerOrFind("CC(C)Cc1ccc(cc1)C(C)C(=O)O");
    const s = "CC(C)Cc1ccc(cc1)[C@H](C)C(=O)O";
    const r = await post({ smiles: s });
    if (r.status === 409 && (r.json as Json).reason === "duplicate") return; // registered by an earlier run of this file
    expect(r.status).toBe(409);
    expect((r.json as Json).error).toMatch(/Another stereo form of this structure is registered as INH-\d{6}/);
    const r2 = await post({ smiles: s, distinctReason: "single enantiomer, (S) as drawn" });
    expect(r2.status).toBe(201);
    const [row] = await db
      .select()
      .from(compounds)
      .where(eq(compounds.registryId, (r2.json as Json).registryId as string));
    expect(row!.distinctReason).toBe("single enantiomer, (S) as drawn");
  });

  it("keeps the parent of a salt and records the counter-ion as the batch's salt form", async () => {
    const smiles = `${uniqueSmiles()}.Cl`;
    const r = await post({
      smiles,
      batch: { supplier: "Invented Supplier", purityPct: 98.5, amount: 12, amountUnit: "mg" },
      stock: { concentrationMm: 10, solvent: "DMSO", volumeUl: 500 },
    });
    expect(r.status).toBe(201);
    const j = r.json as Json;
    expect(j.batchNumber).toBe(1);
    expect(j.formula as string).not.toContain("Cl");
    const d = await getCompound(j.registryId as string);
    expect(d.batches[0]).toMatchObject({
      batchNumber: 1,
      saltForm: "Cl",
      supplier: "Invented Supplier",
      purityPct: 98.5,
      amount: 12,
      amountUnit: "mg",
    });
    expect(d.stocks[0]).toMatchObject({ batchNumber: 1, concentrationMm: 10, solvent: "DMSO", volumeUl: 500 });
    await addBatch(w.people.chemist, j.registryId as string, { supplier: "Second lot (invented)" });
    expect((await getCompound(j.registryId as string)).batches.map((b) => b.batchNumber)).toEqual([1, 2]);
  });

  it("records a structure edit in the audit log with before, after and reason, in the same transaction", async () => {
    const { registryId } = await registerOrFind(uniqueSmiles());
    const newSmiles = uniqueSmiles();
    await editCompound(w.people.chemist, registryId, {
      smiles: newSmiles,
      reason: "corrected chain length after NMR (invented)",
    });
    const [a] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, registryId), eq(auditLog.action, "compound.structure.edit")));
    expect(a!.reason).toBe("corrected chain length after NMR (invented)");
    expect(a!.actorId).toBe(w.people.chemist.id);
    expect((a!.before as Json).smiles).not.toBe((a!.after as Json).smiles);
    await expect(editCompound(w.people.chemist, registryId, { smiles: uniqueSmiles() })).rejects.toThrow(
      /needs a reason/,
    );
  });
});

describe("search", () => {
  it("ranks the exact registry ID first, finds names and aliases, and pages", async () => {
    const tag = crypto.randomBytes(3).toString("hex");
    const a = await post({ smiles: uniqueSmiles(), name: `Zeta-${tag} (invented)`, aliases: [`SUP-${tag}-1`] });
    expect(a.status).toBe(201);
    const id = (a.json as Json).registryId as string;
    const byId = (await search(`q=${id}`)).json as { items: Json[]; total: number };
    expect(byId.items[0]!.registryId).toBe(id);
    expect(byId.items[0]!.rank).toBe("registry ID");
    const byNumber = (await search(`q=${Number(id.slice(4))}`)).json as { items: Json[] };
    expect(byNumber.items[0]!.registryId).toBe(id);
    const byAlias = (await search(`q=sup-${tag}-1`)).json as { items: Json[] };
    expect(byAlias.items[0]!.registryId).toBe(id);
    expect(byAlias.items[0]!.rank).toBe("exact name or alias");
    const byName = (await search(`q=zeta-${tag}`)).json as { items: Json[] };
    expect(byName.items.map((i) => i.registryId)).toContain(id);
    const paged = (await search("limit=2&offset=1")).json as { items: Json[]; total: number };
    expect(paged.items).toHaveLength(2);
    expect(paged.total).toBeGreaterThan(3);
  });

  it("finds substructures through the fingerprint prefilter and the exact check", async () => {
    const { registryId } = await registerOrFind("CC(=O)Oc1ccccc1C(=O)O");
    const r = (await search(`substructure=${encodeURIComponent("OC(=O)c1ccccc1")}&limit=200`)).json as {
      items: Json[];
      total: number;
      totalIsLowerBound: boolean;
      substructure: Json;
    };
    expect(r.items.map((i) => i.registryId)).toContain(registryId);
    expect(r.totalIsLowerBound).toBe(false);
    expect(r.items.length).toBe(r.total);
    // Every hit really contains the fragment (checked here with the exact matcher over the whole table).
    const none = (await search(`substructure=${encodeURIComponent("C1CCCCCCCCCCC1")}`)).json as {
      items: Json[];
      total: number;
    };
    expect(none.total).toBe(0);
    const bad = await search(`substructure=${encodeURIComponent("c1ccc")}`);
    expect(bad.status).toBe(400);
    expect((bad.json as Json).error).toMatch(/Substructure "c1ccc" could not be read/);
  });

  it("refuses bad paging parameters with a sentence", async () => {
    const r = await search("limit=5000");
    expect(r.status).toBe(400);
    expect((r.json as Json).error).toContain("limit must be 1–200");
  });

  it("gives thumbnails as sanitised SVG when asked", async () => {
    const r = await searchCompounds({ limit: 2, offset: 0, thumbnails: true });
    expect(r.items[0]!.svg).toMatch(/^<svg/);
  });
});

describe("results across campaigns", () => {
  it("shows a compound's current results only in campaigns the person is a member of", async () => {
    const { registryId } = await registerOrFind(uniqueSmiles());
    const [e] = await db
      .insert(experiments)
      .values({ campaignId: w.campaignId, name: "Invented screen", kind: "single-dose" })
      .returning();
    const [a] = await db
      .insert(analyses)
      .values({
        experimentId: e!.id,
        campaignId: w.campaignId,
        status: "done",
        engineVersion: "test",
        inputHash: crypto.randomBytes(8).toString("hex"),
        inputs: { runs: [], masks: [], settings: {} } as never,
        isCurrent: true,
      })
      .returning();
    await db
      .insert(compoundResults)
      .values({
        analysisId: a!.id,
        experimentId: e!.id,
        campaignId: w.campaignId,
        kind: "single-dose",
        compoundId: registryId,
        nPoints: 2,
        pctInhibition: 63.5,
        hit: true,
        detail: {},
      });
    const seen = await resultsForCompound({ id: w.people.viewer.id, globalRole: "member" }, registryId);
    expect(seen).toHaveLength(1);
    expect(seen[0]).toMatchObject({ experiment: "Invented screen", pctInhibition: 63.5, hit: true });
    expect(await resultsForCompound({ id: w.people.nonMember.id, globalRole: "member" }, registryId)).toHaveLength(0);
    expect(await resultsForCompound({ id: w.people.admin.id, globalRole: "admin" }, registryId)).toHaveLength(1);
  });
});

describe("libraries", () => {
  it("creates a library from a pasted list, and refuses unknown IDs without creating anything", async () => {
    const ids = [await registerOrFind(uniqueSmiles()), await registerOrFind(uniqueSmiles())].map((x) => x.registryId);
    const name = `Follow-up ${crypto.randomBytes(3).toString("hex")} (invented)`;
    await expect(createLibrary(w.people.chemist, { name, ids: `${ids[0]}\nINH-999999` })).rejects.toThrow(
      /Not in the registry: INH-999999\. Nothing was added\./,
    );
    expect(await db.select().from(compoundLibraries).where(eq(compoundLibraries.name, name))).toHaveLength(0);
    const lib = await createLibrary(w.people.chemist, { name, ids: `${ids[0]}, ${ids[1]}\n${ids[0]}` });
    expect(lib.added).toBe(2);
    await expect(createLibrary(w.people.chemist, { name })).rejects.toThrow(AppError);
    const r = (await search(`library=${lib.id}`)).json as { items: Json[]; total: number };
    expect(r.items.map((i) => i.registryId).sort()).toEqual([...ids].sort());
  });
});

describe("bulk import", () => {
  const upload = async (name: string, text: string | Uint8Array<ArrayBuffer>) => {
    const form = new FormData();
    form.append("file", new File([text], name, { type: "application/octet-stream" }));
    const r = await callRoute(importsRoute.POST, {
      user: w.people.chemist,
      method: "POST",
      path: "/api/compound-imports",
      body: form,
    });
    expect(r.status).toBe(202);
    const id = (r.json as Json).id as string;
    await waitForImport(id);
    return {
      id,
      view: (
        await callRoute(importRoute.GET, {
          user: w.people.chemist,
          path: `/api/compound-imports/${id}`,
          params: { importId: id },
        })
      ).json as Json,
    };
  };
  const commit = (id: string, mode: string) =>
    callRoute(commitRoute.POST, {
      user: w.people.chemist,
      method: "POST",
      path: `/api/compound-imports/${id}/commit`,
      params: { importId: id },
      body: { mode },
    });

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
      user: w.people.viewer,
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

  it("imports SDF (keeping the molfile) and XLSX files the same way", async () => {
    const sdfSmiles = [uniqueSmiles(), uniqueSmiles()];
    const sdf = sdfSmiles
      .map(
        (sm, i) =>
          `${Molecule.fromSmiles(sm)
            .toMolfile()
            .replace(/^[^\n]*/, `SDF-${i + 1} (invented)`)}\n> <supplier>\nInvented Supplier\n\n$$$$\n`,
      )
      .join("");
    const s1 = await upload("two.sdf", sdf);
    expect((s1.view.preview as { valid: number }).valid).toBe(2);
    expect((await commit(s1.id, "all_or_nothing")).status).toBe(200);
    const [row] = await db.select().from(compounds).where(eq(compounds.name, "SDF-1 (invented)"));
    expect(row!.molfile).toMatch(/M {2}END/);
    expect((await getCompound(row!.registryId)).batches[0]!.supplier).toBe("Invented Supplier");

    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet("Compounds");
    ws.addRow(["SMILES", "Name", "Purity (%)"]);
    ws.addRow([uniqueSmiles(), "XLSX-1 (invented)", 99]);
    ws.addRow(["C1CC", "XLSX-2 (invented)", 98]);
    const x = await upload("two.xlsx", new Uint8Array(await wb.xlsx.writeBuffer()));
    const p = x.view.preview as { valid: number; issues: { record: number; line: number; field: string }[] };
    expect(p.valid).toBe(1);
    expect(p.issues).toMatchObject([{ record: 2, line: 3, field: "smiles" }]);
  });

  it("fails a file that is not a compound table with a sentence, and refuses other file types", async () => {
    const { view } = await upload("no-smiles.csv", "name,purity\nA,90\n");
    expect(view.status).toBe("failed");
    expect(view.error as string).toMatch(/^no-smiles\.csv: /);
    const form = new FormData();
    form.append("file", new File(["x"], "compounds.pdf", { type: "application/pdf" }));
    const r = await callRoute(importsRoute.POST, {
      user: w.people.chemist,
      method: "POST",
      path: "/api/compound-imports",
      body: form,
    });
    expect(r.status).toBe(400);
    expect((r.json as Json).error).toContain("use a .csv, .xlsx or .sdf file");
  });

  it("prepares a larger file on two worker threads and keeps record order", async () => {
    const n = 700;
    const lines = ["smiles,name"];
    for (let i = 0; i < n; i++)
      lines.push(
        `${"C".repeat(1 + (i % 25))}Oc1ccc(cc1)S(=O)(=O)N${"C".repeat(1 + Math.floor(i / 25))}${i % 2 ? "F" : "Br"},W-${i + 1}`,
      );
    const { view } = await upload("workers.csv", lines.join("\n"));
    const p = view.preview as { threads: number; totalRecords: number; valid: number; sample: { record: number }[] };
    expect(p.totalRecords).toBe(n);
    expect(p.valid).toBe(n);
    expect(p.threads).toBe(2);
    expect(p.sample.map((s) => s.record)).toEqual(Array.from({ length: 50 }, (_, i) => i + 1));
  });
});
