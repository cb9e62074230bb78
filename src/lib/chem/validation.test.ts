import { describe, expect, it } from "vitest";
import { importRecordSchema, normaliseAmountUnit, registerCompoundSchema, zodFieldErrors } from "./validation";

function errors(input: unknown) {
  const r = registerCompoundSchema.safeParse(input);
  return r.success ? [] : zodFieldErrors(r.error);
}

describe("registerCompoundSchema", () => {
  it("accepts a minimal SMILES body and coerces form strings", () => {
    const r = registerCompoundSchema.parse({
      smiles: " CCO ",
      name: "Example",
      aliases: "AB-1; AB-1a ;",
      batch: { supplier: "Invented Supplies", purityPct: "98.5", amount: "25", amountUnit: "mg", date: "2025-03-14" },
      stock: { concentrationMm: "10", solvent: "DMSO", volumeUl: "500", location: "Freezer 2 / Rack B / A07" },
    });
    expect(r.smiles).toBe("CCO");
    expect(r.aliases).toEqual(["AB-1", "AB-1a"]);
    expect(r.batch?.purityPct).toBe(98.5);
    expect(r.stock?.concentrationMm).toBe(10);
  });

  it("requires exactly one of smiles and molfile", () => {
    expect(errors({ name: "x" })).toEqual([{ field: "smiles", message: "Give a structure: a SMILES or a molfile." }]);
    expect(errors({ smiles: "C", molfile: "x V2000" })).toEqual([
      { field: "smiles", message: "Give either a SMILES or a molfile, not both." },
    ]);
    expect(errors({ smiles: "", molfile: "" })).toHaveLength(1);
  });

  it("checks ranges with field paths", () => {
    expect(errors({ smiles: "C", batch: { purityPct: "101" } })).toEqual([
      { field: "batch.purityPct", message: "Purity (%) must be between 0 and 100." },
    ]);
    expect(errors({ smiles: "C", batch: { amount: "5" } })).toEqual([
      { field: "batch.amountUnit", message: "Give the unit of the amount." },
    ]);
    expect(errors({ smiles: "C", batch: { purityPct: "abc" } })[0]?.field).toBe("batch.purityPct");
    expect(errors({ smiles: "C", batch: { date: "2025-02-30" } })[0]?.message).toBe("Not a calendar date.");
  });

  it("refuses formula-like text (OWASP CSV Injection)", () => {
    const e = errors({ smiles: "C", name: '=HYPERLINK("x")', aliases: ["@SUM(1)"] });
    expect(e.map((x) => x.field)).toEqual(["name", "aliases.0"]);
    expect(e[0]?.message).toMatch(/starts with "=", which a spreadsheet may run as a formula/);
  });

  it("normalises amount units", () => {
    expect(normaliseAmountUnit("ug")).toBe("µg");
    expect(normaliseAmountUnit("ML")).toBe("mL");
    expect(normaliseAmountUnit("kg")).toBeUndefined();
    expect(
      registerCompoundSchema.parse({ smiles: "C", batch: { amount: 1, amountUnit: "mcg" } }).batch?.amountUnit,
    ).toBe("µg");
  });

  it("import records take no distinctReason", () => {
    expect(importRecordSchema.parse({ smiles: "C", distinctReason: "x" })).not.toHaveProperty("distinctReason");
  });
});
