/**
 * Registry properties of a normalised parent molecule (see `parse.ts`), all from openchemlib.
 *
 * - `structureKey`: openchemlib's canonical ID code (`getIDCode()`), which encodes constitution,
 *   charges, isotopes and stereo as drawn. Two inputs of the same structure give the same key.
 *   Stereo decision: a stereo centre or double bond drawn without configuration is part of the
 *   key as "unknown", so racemic/undefined ibuprofen and (S)-ibuprofen get different keys and can
 *   both be registered. `flatKey` is the ID code with stereo removed (openchemlib
 *   `CanonizerUtil.NOSTEREO`): equal flat keys with different structure keys mean "another
 *   stereo form of a registered compound", which the server should show and require a reason for
 *   (`distinctReason` in validation.ts).
 * - `canonicalSmiles`: openchemlib's isomeric SMILES of the canonical molecule, for display and
 *   export. Use `structureKey`, not the SMILES, for identity.
 * - `formula` in Hill order (C, H, then the other symbols alphabetically; common practice, as in
 *   PubChem), `mwGPerMol` (average, standard atomic weights) and `exactMassDa` (monoisotopic), from
 *   openchemlib's `getMolecularFormula()`.
 * - `clogp`: openchemlib's atom-increment logP estimate. It is not PubChem's XLogP3 and can differ
 *   by about one unit.
 * - `hbd` / `hba`: openchemlib's counts, which follow the rule-of-five definitions (donors = N–H and
 *   O–H groups; acceptors = all N and O atoms; Lipinski et al., Adv. Drug Deliv. Rev. 1997). PubChem
 *   counts acceptors differently, e.g. caffeine 6 here vs 3 in PubChem.
 * - `tpsaA2`: topological polar surface area in Å² by openchemlib's fragment contributions
 *   (Ertl, Rohde & Selzer, J. Med. Chem. 2000).
 * - `rotatableBonds`: openchemlib's count.
 */
import { CanonizerUtil, Molecule, MoleculeProperties } from "openchemlib";
import { mayHaveStereo } from "./parse";

export interface CompoundProperties {
  structureKey: string;
  flatKey: string;
  canonicalSmiles: string;
  formula: string;
  mwGPerMol: number;
  exactMassDa: number;
  heavyAtomCount: number;
  clogp: number;
  hbd: number;
  hba: number;
  tpsaA2: number;
  rotatableBonds: number;
  /** Tetrahedral stereo centres (defined or not). */
  stereoCentres: number;
  /** Stereo centres and stereo double bonds drawn without a configuration. */
  undefinedStereo: number;
}

/** The properties under their public names (API and screens): mw g/mol, exactMass Da, tpsa Å². */
export function publicProperties(p: CompoundProperties) {
  return {
    smiles: p.canonicalSmiles,
    formula: p.formula,
    mw: p.mwGPerMol,
    exactMass: p.exactMassDa,
    heavyAtoms: p.heavyAtomCount,
    clogp: p.clogp,
    hbd: p.hbd,
    hba: p.hba,
    tpsa: p.tpsaA2,
    rotatableBonds: p.rotatableBonds,
  };
}
export type PublicProperties = ReturnType<typeof publicProperties>;

const round = (x: number, digits: number): number => {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
};

/**
 * Reorders an openchemlib formula string (which lists e.g. `C2H3O2Na`) into Hill order
 * (`C2H3NaO2`): carbon, hydrogen, then alphabetical; without carbon, all alphabetical. A formula
 * with anything but element symbols and counts is returned unchanged.
 */
export function toHillFormula(formula: string): string {
  if (!/^([A-Z][a-z]?\d*)+$/.test(formula)) return formula;
  const counts = new Map<string, number>();
  for (const m of formula.matchAll(/([A-Z][a-z]?)(\d*)/g)) {
    const el = m[1] ?? "";
    counts.set(el, (counts.get(el) ?? 0) + (m[2] ? Number(m[2]) : 1));
  }
  const symbols = [...counts.keys()].sort();
  const order = counts.has("C") ? ["C", "H", ...symbols.filter((e) => e !== "C" && e !== "H")] : symbols;
  return order
    .filter((e) => counts.has(e))
    .map((e) => {
      const n = counts.get(e) ?? 0;
      return n === 1 ? e : `${e}${n}`;
    })
    .join("");
}

/** The structure key alone (cheaper than all properties). */
export function structureKey(mol: Molecule): string {
  return mol.getIDCode();
}

/**
 * The stereo-free key: equal for all stereo forms of one constitution. For a molecule that cannot
 * have a stereo element (parse.ts `mayHaveStereo`) it equals the structure key (the stereo-free ID code
 * costs several times a normal one, so it is only computed when it can differ; tests check the
 * shortcut against openchemlib's NOSTEREO code).
 */
export function flatKey(mol: Molecule): string {
  return mayHaveStereo(mol) ? CanonizerUtil.getIDCode(mol, CanonizerUtil.NOSTEREO) : mol.getIDCode();
}

function countUndefinedStereo(mol: Molecule): { centres: number; undefinedStereo: number } {
  if (!mayHaveStereo(mol)) return { centres: 0, undefinedStereo: 0 };
  mol.ensureHelperArrays(Molecule.cHelperParities);
  let centres = 0;
  let undef = 0;
  for (let a = 0; a < mol.getAtoms(); a++) {
    if (!mol.isAtomStereoCenter(a)) continue;
    centres++;
    if (mol.getAtomParity(a) === Molecule.cAtomParityUnknown) undef++;
  }
  for (let b = 0; b < mol.getBonds(); b++) {
    if (mol.getBondOrder(b) === 2 && mol.getBondParity(b) === Molecule.cBondParityUnknown) undef++;
  }
  return { centres, undefinedStereo: undef };
}

/**
 * All registry properties. Numbers are rounded for storage: masses to 4 decimals (g/mol, Da),
 * cLogP to 2, TPSA to 1 (Å²).
 */
export function computeProperties(mol: Molecule): CompoundProperties {
  const f = mol.getMolecularFormula();
  const p = new MoleculeProperties(mol);
  let heavy = 0;
  for (let a = 0; a < mol.getAllAtoms(); a++) if (mol.getAtomicNo(a) > 1) heavy++;
  const stereo = countUndefinedStereo(mol);
  return {
    structureKey: structureKey(mol),
    flatKey: flatKey(mol),
    canonicalSmiles: mol.toIsomericSmiles(),
    formula: toHillFormula(f.formula),
    mwGPerMol: round(f.relativeWeight, 4),
    exactMassDa: round(f.absoluteWeight, 4),
    heavyAtomCount: heavy,
    clogp: round(p.logP, 2),
    hbd: p.donorCount,
    hba: p.acceptorCount,
    tpsaA2: round(p.polarSurfaceArea, 1),
    rotatableBonds: p.rotatableBondCount,
    stereoCentres: stereo.centres,
    undefinedStereo: stereo.undefinedStereo,
  };
}
