import { CanonizerUtil, Molecule } from "openchemlib";
import { describe, expect, it } from "vitest";
import { demoCompounds } from "./demo-compounds";
import { PUBLIC_MOLECULES } from "./fingerprint.test";
import { parseSmiles } from "./parse";
import { computeProperties, flatKey, structureKey, toHillFormula } from "./properties";

function mol(smiles: string) {
  const r = parseSmiles(smiles);
  if (!r.ok) throw new Error(r.error);
  return r.molecule;
}

/**
 * Reference values: PubChem compound records (formula, molecular weight, monoisotopic mass,
 * heavy-atom count, H-bond donor count, TPSA, rotatable-bond count). Quoted from memory, not
 * re-checked online (no internet here). MW and exact mass were re-derived with python3 from the
 * formulas with standard atomic weights (C 12.011, H 1.008, N 14.007, O 15.999) and isotope masses
 * (¹²C 12, ¹H 1.007825, ¹⁴N 14.003074, ¹⁶O 15.994915), which agree.
 *
 * Acceptors are checked against the rule-of-five definition (number of N + O atoms; Lipinski et
 * al., Adv. Drug Deliv. Rev. 23 (1997) 3–25), counted here from the formula, not against PubChem,
 * whose acceptor count uses another definition.
 *
 * logP: experimental octanol/water values (from memory: aspirin 1.19, caffeine −0.07,
 * ibuprofen 3.97, paracetamol 0.46). openchemlib's cLogP is an estimate; we only check it is within
 * 1.1 log units, a sanity bound, not a validation of the method.
 */
const reference = [
  {
    name: "aspirin",
    smiles: "CC(=O)Oc1ccccc1C(O)=O",
    formula: "C9H8O4",
    mw: 180.16,
    exact: 180.0423,
    heavy: 13,
    hbd: 1,
    tpsa: 63.6,
    rot: 3,
    logP: 1.19,
  },
  {
    name: "caffeine",
    smiles: "Cn1cnc2c1c(=O)n(C)c(=O)n2C",
    formula: "C8H10N4O2",
    mw: 194.19,
    exact: 194.0804,
    heavy: 14,
    hbd: 0,
    tpsa: 58.4,
    rot: 0,
    logP: -0.07,
  },
  {
    name: "ibuprofen",
    smiles: "CC(C)Cc1ccc(cc1)C(C)C(O)=O",
    formula: "C13H18O2",
    mw: 206.28,
    exact: 206.1307,
    heavy: 15,
    hbd: 1,
    tpsa: 37.3,
    rot: 4,
    logP: 3.97,
  },
  {
    name: "paracetamol",
    smiles: "CC(=O)Nc1ccc(O)cc1",
    formula: "C8H9NO2",
    mw: 151.16,
    exact: 151.0633,
    heavy: 11,
    hbd: 2,
    tpsa: 49.3,
    rot: 1,
    logP: 0.46,
  },
];

function nPlusO(formula: string): number {
  let n = 0;
  for (const m of formula.matchAll(/([A-Z][a-z]?)(\d*)/g)) {
    if (m[1] === "N" || m[1] === "O") n += m[2] ? Number(m[2]) : 1;
  }
  return n;
}

describe("computeProperties against PubChem records (values from memory)", () => {
  it.each(reference)("$name", (ref) => {
    const p = computeProperties(mol(ref.smiles));
    expect(p.formula).toBe(ref.formula);
    expect(p.mwGPerMol).toBeCloseTo(ref.mw, 2);
    expect(p.exactMassDa).toBeCloseTo(ref.exact, 3);
    expect(p.heavyAtomCount).toBe(ref.heavy);
    expect(p.hbd).toBe(ref.hbd);
    expect(p.hba).toBe(nPlusO(ref.formula));
    expect(p.tpsaA2).toBeCloseTo(ref.tpsa, 1);
    expect(p.rotatableBonds).toBe(ref.rot);
    expect(Math.abs(p.clogp - ref.logP)).toBeLessThan(1.1);
  });
});

describe("structure key", () => {
  it("is the same for two SMILES of aspirin", () => {
    expect(structureKey(mol("OC(=O)c1ccccc1OC(C)=O"))).toBe(structureKey(mol("CC(=O)Oc1ccccc1C(O)=O")));
  });

  it("is the same for Kekulé and aromatic benzene rings (common practice)", () => {
    expect(structureKey(mol("C1=CC=CC=C1C"))).toBe(structureKey(mol("Cc1ccccc1")));
  });

  it("separates a stereo-undefined form from a defined enantiomer; the flat key joins them", () => {
    const undefinedForm = mol("CC(C)Cc1ccc(cc1)C(C)C(O)=O");
    const sForm = mol("CC(C)Cc1ccc(cc1)[C@H](C)C(O)=O");
    const rForm = mol("CC(C)Cc1ccc(cc1)[C@@H](C)C(O)=O");
    expect(structureKey(undefinedForm)).not.toBe(structureKey(sForm));
    expect(structureKey(sForm)).not.toBe(structureKey(rForm));
    expect(flatKey(undefinedForm)).toBe(flatKey(sForm));
    expect(flatKey(rForm)).toBe(flatKey(sForm));
    expect(computeProperties(undefinedForm)).toMatchObject({ stereoCentres: 1, undefinedStereo: 1 });
    expect(computeProperties(sForm)).toMatchObject({ stereoCentres: 1, undefinedStereo: 0 });
  });

  it("counts an undefined double-bond geometry", () => {
    expect(computeProperties(mol("CC=CC")).undefinedStereo).toBe(1);
    expect(computeProperties(mol("C/C=C/C")).undefinedStereo).toBe(0);
  });
});

describe("toHillFormula (Hill order: C, H, then alphabetical; common practice)", () => {
  it.each([
    ["C2H3O2Na", "C2H3NaO2"],
    ["C6H16NCl", "C6H16ClN"],
    ["H2O", "H2O"],
    ["ClNa", "ClNa"],
    ["C9H8O4", "C9H8O4"],
  ])("%s → %s", (input, hill) => {
    expect(toHillFormula(input)).toBe(hill);
  });
});

describe("speed shortcuts give the same keys as openchemlib's plain path (openchemlib is the reference)", () => {
  const inputs = [
    ...PUBLIC_MOLECULES,
    ...demoCompounds().map((c) => c.smiles),
    "CC(C)Cc1ccc(cc1)C(C)C(O)=O",
    "CC=CC",
    "C/C=C/C",
    "CC(O)C(C)O",
    "C[C@H](O)[C@@H](C)O",
    "OC1CCC(O)CC1",
    "CC(=NO)c1ccccc1",
    "C1=CCCCCCC1",
    "CC=C=CC",
    "CC(N)C=CC(C)O",
  ];

  it("parsing without coordinates (SMILES with no @ / \\ marks) gives the key of Molecule.fromSmiles", () => {
    for (const s of inputs) {
      const reference = Molecule.fromSmiles(s);
      reference.canonizeCharge(true);
      expect(structureKey(mol(s)), s).toBe(reference.getIDCode());
    }
  });

  it("flatKey's shortcut equals CanonizerUtil NOSTEREO", () => {
    for (const s of inputs) {
      const m = mol(s);
      expect(flatKey(m), s).toBe(CanonizerUtil.getIDCode(m, CanonizerUtil.NOSTEREO));
    }
  });
});
