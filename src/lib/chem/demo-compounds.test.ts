/** Checks on the INVENTED demo data: it must load cleanly. No reference values here. */
import { describe, expect, it } from "vitest";
import { DEMO_SERIES, demoCompounds } from "./demo-compounds";
import { fingerprint, fingerprintContains } from "./fingerprint";
import { parseSmiles } from "./parse";
import { computeProperties } from "./properties";
import { createSubstructureMatcher, parseFragmentQuery } from "./substructure";
import { registerCompoundSchema } from "./validation";

const compounds = demoCompounds();
const parsed = compounds.map((c) => {
  const r = parseSmiles(c.smiles, { multiComponent: "reject" });
  if (!r.ok) throw new Error(`${c.name}: ${r.error}`);
  return { c, mol: r.molecule, props: computeProperties(r.molecule) };
});

describe("demoCompounds (invented)", () => {
  it("has about 300 compounds in four series and is deterministic", () => {
    expect(compounds).toHaveLength(300);
    expect(new Set(compounds.map((c) => c.series))).toEqual(new Set(DEMO_SERIES.map((s) => s.code)));
    expect(demoCompounds()).toEqual(compounds);
  });

  it("every structure parses and is unique by structure key; names are unique", () => {
    expect(new Set(parsed.map((p) => p.props.structureKey)).size).toBe(compounds.length);
    expect(new Set(compounds.map((c) => c.name)).size).toBe(compounds.length);
  });

  it("structures are small-molecule sized (common practice: MW roughly 200–550 g/mol)", () => {
    for (const p of parsed) {
      expect(p.props.mwGPerMol, p.c.name).toBeGreaterThan(200);
      expect(p.props.mwGPerMol, p.c.name).toBeLessThan(550);
    }
  });

  it("every record passes the register schema", () => {
    for (const c of compounds) {
      for (const batch of c.batches) {
        expect(
          registerCompoundSchema.safeParse({ smiles: c.smiles, name: c.name, aliases: c.aliases, batch }).success,
        ).toBe(true);
      }
      for (const { batchIndex, ...stock } of c.stocks) {
        expect(batchIndex).toBeLessThan(c.batches.length);
        expect(registerCompoundSchema.safeParse({ smiles: c.smiles, stock }).success).toBe(true);
      }
    }
  });

  it("each series' scaffold finds exactly its own members, and the fingerprint prefilter keeps them all", () => {
    const scaffolds: Record<string, string> = {
      AP: "O=C(N)c1ccnc(N)n1",
      BS: "O=S(=O)(N)c1ccc2[nH]cnc2c1",
      PP: "Cn1nc(C(=O)N2CCCCC2)cc1",
      QE: "c1ccc2nccc(O)c2c1",
    };
    const fps = parsed.map((p) => fingerprint(p.mol));
    for (const [code, text] of Object.entries(scaffolds)) {
      const q = parseFragmentQuery(text);
      if (!q.ok) throw new Error(q.error);
      const match = createSubstructureMatcher(q);
      parsed.forEach((p, i) => {
        const hit = match(p.mol);
        expect(hit, `${code} scaffold in ${p.c.name}`).toBe(p.c.series === code);
        const fp = fps[i];
        if (hit && fp) expect(fingerprintContains(fp, q.fingerprint)).toBe(true);
      });
    }
  });
});
