// Size caps per structure (parse.ts). The structures are INVENTED (carbon chains and glycine
// repeats chosen only for their size); the caps follow the sizes of known registered drugs named
// in parse.ts (semaglutide's 291 heavy atoms from its formula C187H291N45O59, from memory).
import { describe, expect, it } from "vitest";
import { MAX_HEAVY_ATOMS, MAX_MOLFILE_ATOMS, parseMolfile, parseSmiles } from "./parse";
import { prepareImport } from "./import-prepare";

/** A V3000 molfile (V2000 holds at most 999 atoms) of a carbon chain of `atoms` atoms (invented). */
function chainMolfile(atoms: number): string {
  const lines = ["invented chain", "  test", "", "  0  0  0     0  0            999 V3000", "M  V30 BEGIN CTAB"];
  lines.push(`M  V30 COUNTS ${atoms} ${atoms - 1} 0 0 0`, "M  V30 BEGIN ATOM");
  for (let i = 1; i <= atoms; i++) lines.push(`M  V30 ${i} C ${(i * 1.5).toFixed(4)} 0 0 0`);
  lines.push("M  V30 END ATOM", "M  V30 BEGIN BOND");
  for (let i = 1; i < atoms; i++) lines.push(`M  V30 ${i} 1 ${i} ${i + 1}`);
  lines.push("M  V30 END BOND", "M  V30 END CTAB", "M  END");
  return lines.join("\n");
}

describe("structure size caps", () => {
  it("accepts a peptide-sized structure at the cap and refuses one heavy atom more, with the count", () => {
    expect(parseSmiles("C".repeat(MAX_HEAVY_ATOMS)).ok).toBe(true);
    const r = parseSmiles("C".repeat(MAX_HEAVY_ATOMS + 1));
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.error).toMatch(new RegExp(`has ${MAX_HEAVY_ATOMS + 1} heavy atoms; .* at most ${MAX_HEAVY_ATOMS}`));
  });

  it("refuses a valid 1,900-character SMILES before the expensive steps (under 1 s here instead of ~20 s)", () => {
    const t = performance.now();
    const r = parseSmiles("C".repeat(1900));
    expect(r.ok).toBe(false);
    expect(performance.now() - t).toBeLessThan(1000);
  });

  it("reads a small V3000 molfile of the same shape (the generator is valid)", () => {
    expect(parseMolfile(chainMolfile(20)).ok).toBe(true);
  });

  it("refuses a 5,000-atom molfile from its counts line, without parsing it", () => {
    const t = performance.now();
    const r = parseMolfile(chainMolfile(5000));
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.error).toContain(`declares 5000 atoms; a registered structure may have at most ${MAX_MOLFILE_ATOMS}`);
    expect(performance.now() - t).toBeLessThan(500);
  });

  it("names the record and the line of an over-size record in an import", () => {
    const r = prepareImport([
      { recordNo: 1, line: 2, smiles: "CCO" },
      { recordNo: 2, line: 3, smiles: "C".repeat(600) },
    ]);
    expect(r.prepared.map((p) => p.recordNo)).toEqual([1]);
    expect(r.issues).toEqual([
      expect.objectContaining({
        record: 2,
        line: 3,
        field: "smiles",
        message: expect.stringContaining("600 heavy atoms"),
      }),
    ]);
  });
});
