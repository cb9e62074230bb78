import { describe, expect, it } from "vitest";
import {
  FINGERPRINT_BITS,
  bitCount,
  fingerprint,
  fingerprintContains,
  fromBitString,
  fromHex,
  tanimoto,
  toBitString,
  toHex,
} from "./fingerprint";
import { parseSmiles } from "./parse";
import { createSubstructureMatcher, parseFragmentQuery } from "./substructure";

function mol(smiles: string) {
  const r = parseSmiles(smiles);
  if (!r.ok) throw new Error(r.error);
  return r.molecule;
}

/** Public, well-known drugs and reagents (structures written from memory as SMILES). */
export const PUBLIC_MOLECULES = [
  "CC(=O)Oc1ccccc1C(O)=O", // aspirin
  "Cn1cnc2c1c(=O)n(C)c(=O)n2C", // caffeine
  "CC(C)Cc1ccc(cc1)C(C)C(O)=O", // ibuprofen
  "CC(=O)Nc1ccc(O)cc1", // paracetamol
  "CN1CCC[C@H]1c1cccnc1", // nicotine
  "OC(=O)c1ccccc1O", // salicylic acid
  "CN(C)C(=N)NC(N)=N", // metformin
  "O=C(O)Cc1ccccc1Nc1c(Cl)cccc1Cl", // diclofenac
  "COc1ccc2[nH]cc(CCN(C)C)c2c1", // 5-methoxy-DMT
  "CC(C)NCC(O)COc1cccc2ccccc12", // propranolol
  "Clc1ccc(cc1)C(c1ccccc1)N1CCN(CC1)CCOCC(=O)O", // cetirizine
  "CS(=O)(=O)c1ccc(cc1)C1=C(C(=O)OC1)c1ccccc1", // rofecoxib
  "c1ccc2c(c1)[nH]c1ccccc12", // carbazole
  "OC1CCCCC1", // cyclohexanol
  "FC(F)(F)c1ccc(Oc2ccccc2)cc1", // trifluoromethyl diphenyl ether
  "C1CC2CCC1C2", // norbornane
  "O=C1NC(=O)C(N1)(c1ccccc1)c1ccccc1", // phenytoin
  "CC1(C)S[C@@H]2[C@H](NC(=O)Cc3ccccc3)C(=O)N2[C@H]1C(O)=O", // penicillin G
  "NS(=O)(=O)c1cc(C(O)=O)c(NCc2ccco2)cc1Cl", // furosemide
  "CCOC(=O)C1=C(C)NC(C)=C(C1c1cccc(c1)[N+]([O-])=O)C(=O)OC", // nitrendipine
  "N#Cc1ccc(cc1)C(O)=O", // 4-cyanobenzoic acid
  "C#CCO", // propargyl alcohol
  "CC(C)(C#N)c1ccccc1", // 2-methyl-2-phenylpropanenitrile
];

const FRAGMENTS = [
  "c1ccccc1",
  "C1=CC=CC=C1",
  "C(=O)O",
  "C(=O)[OH]",
  "c1ccncc1",
  "C1CCCCC1",
  "N",
  "Cl",
  "[F,Cl,Br,I]",
  "*C(=O)O",
  "C(F)(F)F",
  "S(=O)(=O)N",
  "c1ccc2[nH]ccc2c1",
  "[#7;H1]",
  "C~O",
  "[!#6]",
  "[C;R]",
  "c1ccco1",
  "N1CCNCC1",
  "C1CCCC1",
  "O=C1NC(=O)CN1",
  "[N+](=O)[O-]",
  "OCC(O)C",
  "c1ccc2ccccc2c1",
  "CCOC(=O)",
  "C#N",
  "C#C",
  "C~N",
  "N#Cc1ccccc1",
];

describe("fingerprint soundness against openchemlib's exact matcher (the outside reference)", () => {
  it("never drops a true match: fragment bits ⊆ molecule bits whenever SSSearcher finds the fragment", () => {
    const mols = PUBLIC_MOLECULES.map((s) => ({ s, m: mol(s) }));
    const fps = mols.map(({ m }) => fingerprint(m));
    let matches = 0;
    let screenedOut = 0;
    let nonMatches = 0;
    for (const text of FRAGMENTS) {
      const q = parseFragmentQuery(text);
      if (!q.ok) throw new Error(q.error);
      const match = createSubstructureMatcher(q);
      mols.forEach(({ s, m }, i) => {
        const fp = fps[i];
        if (!fp) throw new Error("missing fingerprint");
        const passes = fingerprintContains(fp, q.fingerprint);
        if (match(m)) {
          matches++;
          expect(passes, `${text} in ${s}`).toBe(true);
        } else {
          nonMatches++;
          if (!passes) screenedOut++;
        }
      });
    }
    expect(matches).toBeGreaterThan(50);
    // The prefilter must also be useful: it removes most non-matches.
    expect(screenedOut / nonMatches).toBeGreaterThan(0.6);
  });

  it("a molecule contains itself as a fragment", () => {
    for (const s of PUBLIC_MOLECULES) {
      const q = parseFragmentQuery(s);
      if (!q.ok) throw new Error(q.error);
      expect(fingerprintContains(fingerprint(mol(s)), q.fingerprint), s).toBe(true);
    }
  });

  it("is deterministic and independent of atom order", () => {
    expect(toHex(fingerprint(mol("OC(=O)c1ccccc1OC(C)=O")))).toBe(toHex(fingerprint(mol("CC(=O)Oc1ccccc1C(O)=O"))));
  });
});

describe("encodings", () => {
  const fp = fingerprint(mol("CC(=O)Nc1ccc(O)cc1"));

  it("bit string round-trips and has the Postgres bit(1024) length", () => {
    const bits = toBitString(fp);
    expect(bits).toHaveLength(FINGERPRINT_BITS);
    expect(bits.replace(/0/g, "")).toHaveLength(bitCount(fp));
    expect(toHex(fromBitString(bits))).toBe(toHex(fp));
  });

  it("hex round-trips", () => {
    expect(toBitString(fromHex(toHex(fp)))).toBe(toBitString(fp));
  });

  it("rejects malformed strings", () => {
    expect(() => fromBitString("01")).toThrow(/1024 characters/);
    expect(() => fromHex("zz")).toThrow(/256 hexadecimal/);
  });

  it("Tanimoto: 1 for itself, symmetric, in [0, 1] (definition: Willett 1998)", () => {
    const other = fingerprint(mol("CC(=O)Oc1ccccc1C(O)=O"));
    expect(tanimoto(fp, fp)).toBe(1);
    expect(tanimoto(fp, other)).toBe(tanimoto(other, fp));
    expect(tanimoto(fp, other)).toBeGreaterThan(0);
    expect(tanimoto(fp, other)).toBeLessThan(1);
  });
});
