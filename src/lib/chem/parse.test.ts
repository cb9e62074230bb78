import { describe, expect, it } from "vitest";
import { parseMolfile, parseSmiles, parseStructure } from "./parse";
import { structureKey } from "./properties";

function ok(result: ReturnType<typeof parseSmiles>) {
  if (!result.ok) throw new Error(`expected a structure, got: ${result.error}`);
  return result;
}

function error(result: ReturnType<typeof parseSmiles>): string {
  if (result.ok) throw new Error("expected a parse failure");
  return result.error;
}

describe("parseSmiles: bad input gives a sentence, never a throw", () => {
  // SMILES grammar per the OpenSMILES specification (opensmiles.org): ring-closure digits come in
  // pairs, branches are balanced, element symbols are from the periodic table.
  it.each([
    ["C1CC", 'SMILES "C1CC" could not be read: unclosed ring: ring bond 1 is opened but never closed.'],
    ["CC(C", 'SMILES "CC(C" could not be read: unclosed branch: 1 "(" without matching ")".'],
    ["CC)C", 'SMILES "CC)C" could not be read: a ")" closes a branch that was never opened (at character 3, ")").'],
    ["C[Xx]", 'SMILES "C[Xx]" could not be read: unknown element symbol (at character 2, "[").'],
    ["CC[N", 'SMILES "CC[N" could not be read: a bracket atom "[" is never closed.'],
    ["CC CC", 'SMILES "CC CC" could not be read: it contains spaces or line breaks (a SMILES is one word).'],
  ])("%s", (smiles, message) => {
    expect(error(parseSmiles(smiles))).toBe(message);
  });

  it("rejects an empty structure", () => {
    expect(error(parseSmiles("  "))).toBe("SMILES is empty: enter a structure.");
  });

  it("rejects a pentavalent carbon (common practice: carbon has valence 4)", () => {
    expect(error(parseSmiles("C(C)(C)(C)(C)C"))).toMatch(/more bonds than its valence allows/);
  });

  it("rejects hydrogen-only input", () => {
    expect(error(parseSmiles("[H][H]"))).toMatch(/no heavy atoms/);
  });

  it("caps the length", () => {
    expect(error(parseSmiles("C".repeat(2001)))).toMatch(/limit is 2000/);
  });
});

describe("parseSmiles: normalisation", () => {
  it("keeps the largest component of a salt and reports the counter-ion", () => {
    // Triethylamine hydrochloride → triethylamine parent; sodium acetate → acetic acid parent.
    const salt = ok(parseSmiles("CC[NH+](CC)CC.[Cl-]"));
    expect(salt.removedComponents).toEqual(["[Cl-]"]);
    expect(salt.molecule.toIsomericSmiles()).toBe("CCN(CC)CC");
    expect(salt.warnings[0]).toMatch(/removed: \[Cl-\]/);
    const acetate = ok(parseSmiles("[Na+].CC(=O)[O-]"));
    expect(structureKey(acetate.molecule)).toBe(structureKey(ok(parseSmiles("CC(O)=O")).molecule));
  });

  it("can refuse multi-component input", () => {
    expect(error(parseSmiles("CCO.O", { multiComponent: "reject" }))).toMatch(/2 disconnected components/);
  });

  it("neutralises a zwitterion (glycine) to the same key as the neutral form", () => {
    expect(structureKey(ok(parseSmiles("[NH3+]CC([O-])=O")).molecule)).toBe(
      structureKey(ok(parseSmiles("NCC(=O)O")).molecule),
    );
  });

  it("keeps a quaternary ammonium charged", () => {
    expect(ok(parseSmiles("C[N+](C)(C)C.[Br-]")).molecule.toIsomericSmiles()).toBe("C[N+](C)(C)C");
  });

  it("treats explicit hydrogens like implicit ones", () => {
    expect(structureKey(ok(parseSmiles("[H]OC([H])([H])[H]")).molecule)).toBe(
      structureKey(ok(parseSmiles("CO")).molecule),
    );
  });
});

describe("parseMolfile", () => {
  const ethanolV2000 = [
    "ethanol",
    "  hand-written",
    "",
    "  3  2  0  0  0  0  0  0  0  0999 V2000",
    "    0.0000    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0",
    "    1.2990    0.7500    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0",
    "    2.5981    0.0000    0.0000 O   0  0  0  0  0  0  0  0  0  0  0  0",
    "  1  2  1  0  0  0  0",
    "  2  3  1  0  0  0  0",
    "M  END",
  ].join("\n");

  it("reads a V2000 molfile (CTfile format, connection-table layout) to the same key as its SMILES", () => {
    const r = parseMolfile(ethanolV2000);
    expect(r.ok).toBe(true);
    if (r.ok) expect(structureKey(r.molecule)).toBe(structureKey(ok(parseSmiles("CCO")).molecule));
  });

  it("ignores SDF data items after M  END", () => {
    const r = parseMolfile(`${ethanolV2000}\n> <name>\nX\n\n$$$$\n`);
    expect(r.ok).toBe(true);
  });

  it("explains text that is not a molfile", () => {
    const r = parseMolfile("hello\nworld\n");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error).toMatch(/no V2000 or V3000 counts line/);
  });

  it("rejects a molfile with no atoms", () => {
    const r = parseMolfile("empty\n\n\n  0  0  0  0  0  0  0  0  0  0999 V2000\nM  END\n");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error).toBe("Molfile is empty: it contains no atoms.");
  });

  it("round-trips through parseStructure", () => {
    expect(parseStructure({ molfile: ethanolV2000 }).ok).toBe(true);
    expect(parseStructure({ smiles: "CCO" }).ok).toBe(true);
  });
});
