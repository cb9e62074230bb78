// Worked values computed by hand from the published definitions (not taken from a table):
// pKi = −log10(Ki / M); LE = 1.37·pKi/HA (Hopkins, Groom & Alex, Drug Discov Today 2004);
// LipE = pKi − cLogP (Leeson & Springthorpe, Nat Rev Drug Discov 2007).
import { describe, it, expect } from "vitest";
import {
  efficiencySql,
  LE_KCAL_PER_MOL_PER_LOG_UNIT,
  ligandEfficiency,
  lipophilicEfficiency,
  PKI_OFFSET_UM,
  pKiFromMicromolar,
} from "./efficiency";

describe("pKi, LE and LipE from their published definitions", () => {
  it("Ki 10 nM (0.01 µM) is pKi 8; 1 µM is 6; 1 mM is 3", () => {
    expect(pKiFromMicromolar(0.01)).toBeCloseTo(8, 12);
    expect(pKiFromMicromolar(1)).toBe(6);
    expect(pKiFromMicromolar(1000)).toBeCloseTo(3, 12);
  });
  it("pKi 8 with 25 heavy atoms gives LE 1.37·8/25 = 0.4384 kcal/mol per heavy atom", () => {
    expect(ligandEfficiency(8, 25)).toBeCloseTo(0.4384, 12);
  });
  it("pKi 8 with cLogP 3 gives LipE 5", () => {
    expect(lipophilicEfficiency(8, 3)).toBe(5);
  });
  it("is null rather than a number when an input is missing or impossible", () => {
    expect(pKiFromMicromolar(0)).toBeNull();
    expect(pKiFromMicromolar(null)).toBeNull();
    expect(ligandEfficiency(8, 0)).toBeNull();
    expect(ligandEfficiency(null, 25)).toBeNull();
    expect(lipophilicEfficiency(8, null)).toBeNull();
  });
});

describe("the SQL text of the same definitions", () => {
  it("is built from the same constants (pKi offset 6 for µM, LE factor 1.37)", () => {
    expect(PKI_OFFSET_UM).toBe(6);
    expect(LE_KCAL_PER_MOL_PER_LOG_UNIT).toBe(1.37);
    const s = efficiencySql({ kiUm: "m.ki_um", pKi: "b.p_ki", heavyAtoms: "b.heavy_atoms", clogp: "b.clogp" });
    expect(s.pKi).toBe("case when m.ki_um > 0 then 6 - log(m.ki_um) end");
    expect(s.le).toBe("case when b.heavy_atoms > 0 then 1.37 * b.p_ki / b.heavy_atoms end");
    expect(s.lipe).toBe("b.p_ki - b.clogp");
  });
});
