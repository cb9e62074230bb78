// Planner rules from the NIH Assay Guidance Manual (Markossian et al., eds.), "Mechanism of
// Action Assays for Enzymes" (second-hand) and common practice; the Ki estimate is Cheng–Prusoff's competitive form
// (Cheng & Prusoff 1973).
import { describe, it, expect } from "vitest";
import { planMechanismStudy } from "./planner";
import { validatePlateMap, plateMapFromWells } from "@/lib/plates";

describe("mechanism-study planner", () => {
  const plan = planMechanismStudy({ compound: "INH-000007", ic50Um: 2, kmUm: 20, assaySubstrateUm: 20 });
  it("spans 0.2–10 × Km with 8 substrate concentrations", () => {
    expect(plan.substrateUm).toHaveLength(8);
    expect(plan.substrateUm[0]).toBeCloseTo(4);
    expect(plan.substrateUm.at(-1)).toBeCloseTo(200);
  });
  it("puts inhibitor 0 and 0.3–10 × the expected Ki (IC50 / (1 + S/Km) = 1 µM)", () => {
    expect(plan.expectedKiUm).toBeCloseTo(1);
    expect(plan.inhibitorUm[0]).toBe(0);
    expect(plan.inhibitorUm[1]).toBeCloseTo(0.3);
    expect(plan.inhibitorUm.at(-1)).toBeCloseTo(10);
  });
  it("gives a valid plate map with replicates and at least four wells of each control", () => {
    const map = plateMapFromWells(384, plan.wells);
    expect(validatePlateMap(map)).toEqual([]);
    expect(plan.wells.filter((w) => w.role === "sample")).toHaveLength(8 * plan.inhibitorUm.length * 2);
  });
  it("fits a 96-well plate with fewer inhibitor levels", () => {
    const p = planMechanismStudy({ compound: "INH-000007", ic50Um: 2, kmUm: 20, format: 96 });
    expect(p.inhibitorUm.length * p.replicates).toBeLessThanOrEqual(8);
    expect(validatePlateMap(plateMapFromWells(96, p.wells))).toEqual([]);
  });
  it("warns about tight binding when IC50 < 10·[E]", () => {
    expect(planMechanismStudy({ compound: "X", ic50Um: 0.05, kmUm: 20, enzymeUm: 0.01 }).warnings[0]).toMatch(
      /tight binding/,
    );
  });
});
