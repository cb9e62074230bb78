/**
 * Structure input → one normalised openchemlib molecule, or a human-readable reason why not.
 *
 * Accepted inputs: a SMILES string, an MDL molfile (V2000 or V3000), or one SDF record (a molfile
 * followed by data items and `$$$$`; the data items are ignored here, see `import-sdf.ts`).
 *
 * Normalisation (the same for every input, so the structure key does not depend on how a
 * structure was typed):
 * 1. explicit hydrogens are made implicit (stereo they carried is kept by openchemlib);
 * 2. ambiguous functional-group forms (e.g. nitro written as N(=O)=O) are normalised by
 *    openchemlib's `normalizeAmbiguousBonds`;
 * 3. multi-component input (salts, solvates, mixtures) keeps the largest component as the parent
 *    (openchemlib's `stripSmallFragments`, which counts atoms); the removed components are
 *    reported as canonical SMILES in `removedComponents` so the caller can record them as the
 *    batch's salt/solvate form. Decision: a salt is a property of a batch, not of the compound, so
 *    "X hydrochloride" and "X free base" register as the same compound. Pass
 *    `{ multiComponent: "reject" }` to refuse such input instead;
 * 4. charges are canonised by openchemlib's `canonizeCharge` (zwitterions and the charges left by a
 *    removed counter-ion are neutralised where valences allow; a quaternary ammonium or a lone
 *    carboxylate keeps its net charge).
 *
 * Never throws: openchemlib throws Java-style exceptions on bad input; they are caught and turned
 * into a sentence that names the input and the problem.
 */
import { Molecule } from "openchemlib";

export type StructureFormat = "smiles" | "molfile";

export interface ParseOptions {
  /** What to do with more than one disconnected component. Default "keep-largest". */
  multiComponent?: "keep-largest" | "reject";
}

export interface ParsedStructure {
  ok: true;
  /** The normalised parent molecule. It may have no 2D coordinates (see parseSmiles); svg.ts adds them. */
  molecule: Molecule;
  format: StructureFormat;
  /** Canonical SMILES of the components removed in step 3, largest first. Empty when none. */
  removedComponents: string[];
  /** Things the chemist should see but that do not block registration. */
  warnings: string[];
}

export interface ParseFailure {
  ok: false;
  format: StructureFormat;
  /** One sentence, e.g. `SMILES "C1CC" could not be read: ring bond 1 is opened but never closed.` */
  error: string;
}

export type ParseResult = ParsedStructure | ParseFailure;

/** Longest input we try to parse; a drug-like SMILES is well under 200 characters. */
export const MAX_SMILES_LENGTH = 2000;
/** A molfile for a large natural product is tens of kilobytes; 1 MB is a generous cap. */
export const MAX_MOLFILE_LENGTH = 1_000_000;

/**
 * Size caps per structure, checked before any expensive step (stereo perception, coordinates,
 * properties, drawing), whose cost grows faster than linearly with size: measured here, a
 * 480-atom peptide SMILES costs about 2.7 s to parse with stereo and 0.4 s to draw, a
 * 1,900-atom chain 12 s for its properties. A drug-discovery registry holds small molecules
 * (under ~70 heavy atoms), macrocycles such as cyclosporin A (85 heavy atoms) and peptides such
 * as semaglutide (291 heavy atoms, from its formula C187H291N45O59): 350 heavy atoms covers them
 * with room; bonds between heavy atoms are capped at 420 (a ring system adds one bond per ring).
 * A molfile's atom count includes explicit hydrogens, so its counts line may list up to 1,200
 * atoms and 1,300 bonds before the heavy-atom cap applies. Larger biologics belong in a
 * sequence registry, not here.
 */
export const MAX_HEAVY_ATOMS = 350;
export const MAX_HEAVY_BONDS = 420;
export const MAX_MOLFILE_ATOMS = 1200;
export const MAX_MOLFILE_BONDS = 1300;

/** A sentence when the molecule is larger than the caps above, else undefined. */
export function sizeProblem(mol: Molecule, label: string): string | undefined {
  let heavy = 0;
  for (let a = 0; a < mol.getAllAtoms(); a++) if (mol.getAtomicNo(a) > 1) heavy++;
  if (heavy > MAX_HEAVY_ATOMS)
    return `${label} has ${heavy} heavy atoms; a registered structure may have at most ${MAX_HEAVY_ATOMS} (small molecules, macrocycles and peptides).`;
  let bonds = 0;
  for (let b = 0; b < mol.getAllBonds(); b++)
    if (mol.getAtomicNo(mol.getBondAtom(0, b)) > 1 && mol.getAtomicNo(mol.getBondAtom(1, b)) > 1) bonds++;
  if (bonds > MAX_HEAVY_BONDS)
    return `${label} has ${bonds} bonds between heavy atoms; a registered structure may have at most ${MAX_HEAVY_BONDS}.`;
  return undefined;
}

/** The atom and bond counts a molfile declares (V2000 counts line or V3000 COUNTS), checked before parsing. */
function molfileCountsProblem(text: string): string | undefined {
  let atoms: number | undefined;
  let bonds: number | undefined;
  const v3 = /^M {2}V30 COUNTS\s+(\d+)\s+(\d+)/m.exec(text);
  if (v3) {
    atoms = Number(v3[1]);
    bonds = Number(v3[2]);
  } else {
    const counts = text.split("\n", 4)[3];
    if (counts && /V2000/.test(counts)) {
      atoms = Number(counts.slice(0, 3));
      bonds = Number(counts.slice(3, 6));
    }
  }
  if (atoms !== undefined && Number.isFinite(atoms) && atoms > MAX_MOLFILE_ATOMS)
    return `Molfile declares ${atoms} atoms; a registered structure may have at most ${MAX_MOLFILE_ATOMS} atoms including hydrogens (${MAX_HEAVY_ATOMS} heavy atoms).`;
  if (bonds !== undefined && Number.isFinite(bonds) && bonds > MAX_MOLFILE_BONDS)
    return `Molfile declares ${bonds} bonds; a registered structure may have at most ${MAX_MOLFILE_BONDS}.`;
  return undefined;
}

/** Show at most this many characters of the offending input in a message. */
const QUOTE_LIMIT = 60;

function quote(text: string): string {
  const oneLine = text.replace(/\s+/g, " ");
  return JSON.stringify(oneLine.length > QUOTE_LIMIT ? `${oneLine.slice(0, QUOTE_LIMIT)}…` : oneLine);
}

/** The message of whatever openchemlib threw, without the Java class prefix. */
export function oclMessage(err: unknown): string {
  const raw = err instanceof Error ? err.message : String(err);
  return raw
    .replace(/^[\w$.]*(Exception|Error|Class\$\w+)\s*:\s*/i, "")
    .replace(/^SmilesParser:\s*/i, "")
    .trim();
}

/**
 * Turns openchemlib's SMILES parser messages into plain sentences. Positions from openchemlib are
 * 0-based character offsets; chemists count from 1.
 */
export function explainSmilesError(smiles: string, message: string): string {
  const posMatch = /position\s*:?\s*(\d+)/i.exec(message);
  const pos = posMatch ? Number(posMatch[1]) : undefined;
  const where =
    pos === undefined ? "" : pos >= smiles.length ? " (at the end)" : ` (at character ${pos + 1}, "${smiles[pos]}")`;
  const ring = /dangling ring closure:\s*(\d+)/i.exec(message);
  if (ring) return `unclosed ring: ring bond ${ring[1]} is opened but never closed`;
  if (/closing '\)' without opening/i.test(message)) return `a ")" closes a branch that was never opened${where}`;
  if (/unknown element label|unknown atom label/i.test(message)) return `unknown element symbol${where}`;
  if (/dangling open bond/i.test(message)) return `a bond leads nowhere${where}`;
  if (/aromatic/i.test(message)) return `the aromatic ring cannot be given valid double bonds${where}`;
  return message.replace(/;?\s*position\s*:?\s*\d+/i, "") + where;
}

/** Problems openchemlib's SMILES parser accepts silently; checked before parsing. */
function lexicalProblem(smiles: string): string | undefined {
  if (/\s/.test(smiles)) return "it contains spaces or line breaks (a SMILES is one word)";
  let depth = 0;
  let inBracket = false;
  for (let i = 0; i < smiles.length; i++) {
    const c = smiles[i];
    if (c === "[") {
      if (inBracket) return `a "[" opens inside another bracket atom (at character ${i + 1})`;
      inBracket = true;
    } else if (c === "]") {
      if (!inBracket) return `a "]" closes a bracket atom that was never opened (at character ${i + 1})`;
      inBracket = false;
    } else if (!inBracket && c === "(") depth++;
    else if (!inBracket && c === ")") depth--;
  }
  if (inBracket) return 'a bracket atom "[" is never closed';
  if (depth > 0) return `unclosed branch: ${depth} "(" without matching ")"`;
  return undefined;
}

/** Atoms whose bonds exceed the element's maximum valence (openchemlib parses them silently). */
function valenceProblem(mol: Molecule): string | undefined {
  for (let a = 0; a < mol.getAllAtoms(); a++) {
    if (mol.getFreeValence(a) < 0) {
      return `atom ${a + 1} (${mol.getAtomLabel(a)}) has more bonds than its valence allows`;
    }
  }
  return undefined;
}

/**
 * Conservative, coordinate-free test for a possible stereo element: a tetrahedral stereo centre
 * (openchemlib's topological count), a non-aromatic double bond outside rings smaller than 8
 * whose two atoms both carry another neighbour (E/Z, also allenes), or a biaryl axis of the
 * BINAP type. False positives only cost time. openchemlib's stereo-centre count is the slow part
 * (about 1 ms), so it only runs when some atom could be a centre at all: a non-aromatic atom
 * with at least three non-hydrogen neighbours and no π bond, or an S, P or Se with three or more
 * (sulfoxides, phosphine oxides). Results are cached per molecule object.
 */
export function mayHaveStereo(mol: Molecule): boolean {
  const cached = stereoCache.get(mol);
  if (cached !== undefined) return cached;
  const result = computeMayHaveStereo(mol);
  stereoCache.set(mol, result);
  return result;
}

const stereoCache = new WeakMap<Molecule, boolean>();

function computeMayHaveStereo(mol: Molecule): boolean {
  mol.ensureHelperArrays(Molecule.cHelperRings);
  for (let b = 0; b < mol.getBonds(); b++) {
    if (mol.isBINAPChiralityBond(b)) return true;
    if (mol.getBondOrder(b) !== 2 || mol.isAromaticBond(b)) continue;
    const ring = mol.getBondRingSize(b);
    if (ring > 0 && ring < 8) continue;
    const a1 = mol.getBondAtom(0, b);
    const a2 = mol.getBondAtom(1, b);
    if (mol.getConnAtoms(a1) > 1 && mol.getConnAtoms(a2) > 1) return true;
  }
  let candidate = false;
  for (let a = 0; a < mol.getAtoms() && !candidate; a++) {
    if (mol.getConnAtoms(a) < 3 || mol.isAromaticAtom(a)) continue;
    const z = mol.getAtomicNo(a);
    candidate = z === 15 || z === 16 || z === 34 || mol.getAtomPi(a) === 0;
  }
  return candidate && mol.getStereoCenterCount() > 0;
}

function heavyAtomCount(mol: Molecule): number {
  let n = 0;
  for (let a = 0; a < mol.getAllAtoms(); a++) if (mol.getAtomicNo(a) > 1) n++;
  return n;
}

/**
 * Steps 1–4 of the module doc. Mutates and returns `mol`'s normalised parent (a new molecule when
 * components were removed).
 */
function normalise(mol: Molecule, format: StructureFormat, label: string, options: ParseOptions): ParseResult {
  if (mol.getAllAtoms() === 0) return { ok: false, format, error: `${label} is empty: it contains no atoms.` };
  const size = sizeProblem(mol, label);
  if (size) return { ok: false, format, error: size };
  const valence = valenceProblem(mol);
  if (valence) return { ok: false, format, error: `${label} is not a valid structure: ${valence}.` };

  const warnings: string[] = [];
  let parent = mol;
  const removedComponents: string[] = [];
  // Counting first is ~10× cheaper than getFragments(), which copies every component.
  const componentCount = mol.getFragmentNumbers(new Array<number>(mol.getAllAtoms()).fill(0), false, false);
  const components = componentCount > 1 ? mol.getFragments() : [mol];
  if (components.length > 1) {
    if (options.multiComponent === "reject") {
      return {
        ok: false,
        format,
        error: `${label} has ${components.length} disconnected components; register one component at a time.`,
      };
    }
    // Same ordering rule as openchemlib's stripSmallFragments (most atoms wins; first on a tie).
    let keep = 0;
    components.forEach((c, i) => {
      const best = components[keep];
      if (best && c.getAllAtoms() > best.getAllAtoms()) keep = i;
    });
    components.forEach((c, i) => {
      if (i !== keep) removedComponents.push(c.toIsomericSmiles());
    });
    parent = mol.getCompactCopy();
    parent.stripSmallFragments(false);
    warnings.push(
      `Kept the largest of ${components.length} components as the parent structure; removed: ${removedComponents.join(", ")}. Record the salt or solvate on the batch.`,
    );
  }
  let hasHydrogen = false;
  for (let a = 0; a < parent.getAllAtoms() && !hasHydrogen; a++) hasHydrogen = parent.getAtomicNo(a) === 1;
  if (hasHydrogen) parent.removeExplicitHydrogens();
  parent.normalizeAmbiguousBonds();
  parent.canonizeCharge(true);
  stereoCache.delete(parent); // bond orders may have changed
  if (heavyAtomCount(parent) === 0) {
    return { ok: false, format, error: `${label} contains no heavy atoms (only hydrogen).` };
  }
  return { ok: true, molecule: parent, format, removedComponents, warnings };
}

/** Parses a SMILES string. Leading/trailing whitespace is ignored. */
export function parseSmiles(input: string, options: ParseOptions = {}): ParseResult {
  const smiles = input.trim();
  const label = `SMILES ${quote(smiles)}`;
  if (smiles === "") return { ok: false, format: "smiles", error: "SMILES is empty: enter a structure." };
  if (smiles.length > MAX_SMILES_LENGTH) {
    return {
      ok: false,
      format: "smiles",
      error: `SMILES is ${smiles.length} characters long; the limit is ${MAX_SMILES_LENGTH}.`,
    };
  }
  const lexical = lexicalProblem(smiles);
  if (lexical) return { ok: false, format: "smiles", error: `${label} could not be read: ${lexical}.` };
  let mol: Molecule;
  try {
    // Coordinates cost most of the parse time, and openchemlib needs them only to settle stereo
    // (without them it loses @ / \\ marks, and later steps even give an unspecified double bond a
    // geometry). So: parse without coordinates, and parse again with them when the SMILES has
    // stereo marks or the molecule could have a stereo element (mayHaveStereo, conservative). Most screening compounds have none. The tests
    // check the structure key against openchemlib's plain path. Depictions invent coordinates
    // when they need them (svg.ts).
    // The size cap is checked on this cheap parse (under 0.2 s for 2,000 characters), before the
    // stereo perception and coordinates that made a large SMILES cost seconds.
    mol = Molecule.fromSmiles(smiles, { noCoordinates: true, noStereo: true });
    const size = sizeProblem(mol, label);
    if (size) return { ok: false, format: "smiles", error: size };
    if (/[@/\\]/.test(smiles) || mayHaveStereo(mol)) mol = Molecule.fromSmiles(smiles);
  } catch (err) {
    return {
      ok: false,
      format: "smiles",
      error: `${label} could not be read: ${explainSmilesError(smiles, oclMessage(err))}.`,
    };
  }
  return normalise(mol, "smiles", label, options);
}

/**
 * Parses a molfile (V2000/V3000) or the first record of an SDF (everything after the molfile's
 * `M  END` line is ignored). openchemlib returns an empty molecule for text that is not a molfile;
 * that is reported as "no atoms".
 */
export function parseMolfile(input: string, options: ParseOptions = {}): ParseResult {
  const label = "Molfile";
  if (input.trim() === "")
    return { ok: false, format: "molfile", error: "Molfile is empty: paste or upload a structure." };
  if (input.length > MAX_MOLFILE_LENGTH) {
    return { ok: false, format: "molfile", error: `Molfile is larger than ${MAX_MOLFILE_LENGTH} characters.` };
  }
  // Only the connection table: an SDF record's data items must not reach the molfile reader.
  const end = /^M {2}END[^\S\n]*$/m.exec(input);
  const text = end ? input.slice(0, end.index + end[0].length) + "\n" : input;
  if (!/V2000|V3000/.test(text)) {
    return {
      ok: false,
      format: "molfile",
      error: "Molfile could not be read: no V2000 or V3000 counts line found in the first lines.",
    };
  }
  const counts = molfileCountsProblem(text);
  if (counts) return { ok: false, format: "molfile", error: counts };
  let mol: Molecule;
  try {
    mol = Molecule.fromMolfile(text);
  } catch (err) {
    return { ok: false, format: "molfile", error: `Molfile could not be read: ${oclMessage(err)}.` };
  }
  return normalise(mol, "molfile", label, options);
}

/** Either input form, as the register form and the API send it. */
export function parseStructure(
  input: { smiles: string } | { molfile: string },
  options: ParseOptions = {},
): ParseResult {
  return "smiles" in input ? parseSmiles(input.smiles, options) : parseMolfile(input.molfile, options);
}
