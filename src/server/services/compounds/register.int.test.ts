// Registering compounds through the JSON API against the real Postgres: computed properties,
// unreadable structures, duplicates, stereo forms, salts, batches and the audit of structure edits.
// Outside references: PubChem compound records for aspirin (CID 2244), caffeine (CID 2519) and
// ibuprofen (CID 3672) — molecular formula and molecular weight, quoted from memory (no internet
// here), with MW re-derived in python3 from the formula and standard atomic weights (IUPAC
// conventional values C 12.011, H 1.008, N 14.007, O 15.999), which agree to 0.01 g/mol.
// Other structures here are INVENTED test molecules.
import { describe, it, expect, beforeAll } from "vitest";
import { execFileSync } from "node:child_process";
import { and, eq } from "drizzle-orm";
import { makeWorld, type World } from "@/test/harness";
import { compoundApi, counts, type Json } from "@/test/compound-api";
import { uniqueSmiles } from "@/test/compounds";
import { db } from "@/server/db/client";
import { auditLog, compounds } from "@/server/db/schema";
import { addBatch, editCompound, getCompound } from "@/server/services/compounds";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});
const { post, getOne, registerOrFind } = compoundApi(() => w);

/** MW from the formula with standard atomic weights, computed by python3 (outside the project's code). */
function pythonMw(formula: string): number {
  const script = `
import re,sys
w={'C':12.011,'H':1.008,'N':14.007,'O':15.999}
print(sum(w[e]*(int(n) if n else 1) for e,n in re.findall(r'([A-Z][a-z]?)(\\d*)',sys.argv[1])))`;
  return Number(execFileSync("python3", ["-c", script, formula]).toString().trim());
}

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
    const d = await getCompound(
      { user: { ...w.people.chemist, globalRole: "member" }, all: true },
      j.registryId as string,
    );
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
    expect(
      (
        await getCompound({ user: { ...w.people.chemist, globalRole: "member" }, all: true }, j.registryId as string)
      ).batches.map((b) => b.batchNumber),
    ).toEqual([1, 2]);
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
