import { describe, expect, it } from "vitest";
import { parseSmiles } from "./parse";
import { structureKey } from "./properties";
import { createSubstructureMatcher, exactSearchPage, isSubstructure, parseFragmentQuery } from "./substructure";

function mol(smiles: string) {
  const r = parseSmiles(smiles);
  if (!r.ok) throw new Error(r.error);
  return r.molecule;
}

// Expected answers follow the Daylight SMARTS theory manual's meaning of each primitive
// (element, atom list, negation, hydrogen count, ring membership) — common practice.
describe("isSubstructure", () => {
  it.each([
    ["c1ccccc1", "Cc1ccccc1", true],
    ["C1=CC=CC=C1", "Cc1ccccc1", true],
    ["c1ccccc1", "C1CCCCC1", false],
    ["C(=O)[OH]", "CC(=O)O", true],
    ["C(=O)[OH]", "CC(=O)OC", false],
    ["[N,O]", "CO", true],
    ["[N,O]", "CS", false],
    ["[!#6]", "CO", true],
    ["[!#6]", "CC", false],
    ["[#7;H1]", "CNC", true],
    ["[#7;H1]", "CN(C)C", false],
    ["[C;R]", "C1CC1", true],
    ["[C;R]", "CCC", false],
    ["*C(=O)O", "CC(=O)O", true],
  ])("%s in %s → %s", (fragment, molecule, expected) => {
    expect(isSubstructure(fragment, mol(molecule))).toBe(expected);
  });

  it("accepts a stored ID code (structure key) as the molecule", () => {
    expect(isSubstructure("c1ccncc1", structureKey(mol("CN1CCC[C@H]1c1cccnc1")))).toBe(true);
  });

  it("treats an ID code that decodes to nothing as no match", () => {
    const q = parseFragmentQuery("C");
    if (!q.ok) throw new Error(q.error);
    expect(createSubstructureMatcher(q)("")).toBe(false);
  });
});

describe("parseFragmentQuery errors", () => {
  it.each([
    ["", "Substructure query is empty."],
    ["C[$(CO)]", 'Substructure "C[$(CO)]" could not be used: recursive SMARTS "$(...)" is not supported.'],
    ["CC.O", 'Substructure "CC.O" could not be used: search for one connected fragment (no ".").'],
    ["C1CC", 'Substructure "C1CC" could not be read: unclosed ring: ring bond 1 is opened but never closed.'],
  ])("%j", (text, message) => {
    const q = parseFragmentQuery(text);
    expect(q.ok).toBe(false);
    if (!q.ok) expect(q.error).toBe(message);
  });

  it("reports openchemlib's reading of the query", () => {
    const q = parseFragmentQuery("[F,Cl,Br,I]c1ccccc1");
    expect(q.ok && q.understoodAs).toBe("[F,Cl,Br,I;A]c1ccccc1");
  });
});

describe("exactSearchPage", () => {
  const library = ["Cc1ccccc1", "CCO", "c1ccccc1O", "C1CCCCC1", "c1ccccc1N", "c1ccccc1Cl"].map((s, i) => ({
    id: i + 1,
    structureKey: structureKey(mol(s)),
  }));
  const q = parseFragmentQuery("c1ccccc1");
  if (!q.ok) throw new Error(q.error);

  it("pages through matches in the given order and stops when the page is full", () => {
    const first = exactSearchPage(q, library, { limit: 2 });
    expect(first.items.map((x) => x.id)).toEqual([1, 3]);
    expect(first.complete).toBe(false);
    const second = exactSearchPage(q, library, { offset: 2, limit: 2, countAll: true });
    expect(second.items.map((x) => x.id)).toEqual([5, 6]);
    expect(second).toMatchObject({ matched: 4, checked: 6, complete: true, timedOut: false });
  });

  it("honours the time budget", () => {
    const page = exactSearchPage(q, library, { timeBudgetMs: -1 });
    expect(page).toMatchObject({ items: [], checked: 0, complete: false, timedOut: true });
  });
});
