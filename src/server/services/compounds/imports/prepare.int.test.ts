// Preparing bulk imports against the real Postgres and the S3 fake: SDF (the molfile kept) and
// XLSX files, a file that is not a compound table, other file types, and a larger file prepared on
// two worker threads in record order. The files are written with openchemlib (molfiles) and
// exceljs (XLSX); the structures are INVENTED test molecules.
import { describe, it, expect, beforeAll } from "vitest";
import ExcelJS from "exceljs";
import { Molecule } from "openchemlib";
import { eq } from "drizzle-orm";
import { callRoute, makeWorld, type World } from "@/test/harness";
import { compoundApi, type Json } from "@/test/compound-api";
import { uniqueSmiles } from "@/test/compounds";
import { db } from "@/server/db/client";
import { compounds } from "@/server/db/schema";
import * as importsRoute from "@/app/api/compound-imports/route";
import { getCompound } from "@/server/services/compounds";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});
const { upload, commit } = compoundApi(() => w);

describe("bulk import", () => {
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
    expect(
      (await getCompound({ user: { ...w.people.admin, globalRole: "admin" }, all: true }, row!.registryId)).batches[0]!
        .supplier,
    ).toBe("Invented Supplier");

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
