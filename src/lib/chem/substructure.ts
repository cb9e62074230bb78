/**
 * Substructure search: a query fragment from SMILES or SMARTS, and the exact check that runs on
 * the candidates the fingerprint prefilter (`fingerprint.ts`) leaves.
 *
 * Query language: what openchemlib's SMILES parser accepts in SMARTS mode. Measured here:
 * - SMILES fragments (`c1ccccc1C(=O)O`, `C(F)(F)F`); Kekulé rings match aromatic ones;
 * - element by number `[#7]`, atom lists `[N,O]`, `[F,Cl,Br,I]`, negation `[!#6]`, wildcard `*`,
 *   aliphatic/aromatic `[C;A]`, `c`, hydrogen count `[#7;H1]`, `[OH]`, ring membership `[C;R]`,
 *   `[CX4]`, bond lists `C=,#O`, any bond `~`, ring/non-ring bonds `@`, `!@`.
 * - Not supported (rejected with a message): recursive SMARTS `$(...)`, which openchemlib turns
 *   into a wrong disconnected query, and dot-separated components. `[D3]`, `[r6]`, `[a]` are
 *   refused by openchemlib's parser (its message is passed on).
 * - An uppercase `C` with no bond that forces aliphatic matches aromatic carbon too (`C` finds
 *   benzene); a single bond does not match an aromatic bond (`CC` does not find benzene). Use
 *   `[C;A]` for aliphatic only.
 * - Stereo in the query is ignored (openchemlib's matcher needs an explicit "match stereo" query
 *   feature that SMILES cannot express).
 */
import { Molecule, SSSearcher, SmilesParser } from "openchemlib";
import { type Fingerprint, fingerprint } from "./fingerprint";
import { explainSmilesError, oclMessage } from "./parse";

export const MAX_QUERY_LENGTH = 500;

export interface FragmentQuery {
  ok: true;
  /** openchemlib fragment (`isFragment()` is true). */
  fragment: Molecule;
  fingerprint: Fingerprint;
  /** openchemlib's SMARTS rendering of what it understood, to show the user. */
  understoodAs: string;
}

export type FragmentQueryResult = FragmentQuery | { ok: false; error: string };

/** Parses a substructure query (SMILES or SMARTS). Never throws. */
export function parseFragmentQuery(input: string): FragmentQueryResult {
  const text = input.trim();
  const label = `Substructure ${JSON.stringify(text.length > 60 ? `${text.slice(0, 60)}…` : text)}`;
  if (text === "") return { ok: false, error: "Substructure query is empty." };
  if (text.length > MAX_QUERY_LENGTH) {
    return { ok: false, error: `Substructure query is longer than ${MAX_QUERY_LENGTH} characters.` };
  }
  if (text.includes("$(")) {
    return { ok: false, error: `${label} could not be used: recursive SMARTS "$(...)" is not supported.` };
  }
  if (/\.(?![^[]*\])/.test(text)) {
    return { ok: false, error: `${label} could not be used: search for one connected fragment (no ".").` };
  }
  const parser = new SmilesParser({ smartsMode: "smarts", createSmartsWarnings: true });
  let fragment: Molecule;
  try {
    fragment = parser.parseMolecule(text, { noCoordinates: true });
  } catch (err) {
    return { ok: false, error: `${label} could not be read: ${explainSmilesError(text, oclMessage(err))}.` };
  }
  const warning = parser.getSmartsWarning();
  if (warning) return { ok: false, error: `${label} uses SMARTS features that are not supported: ${warning}.` };
  if (fragment.getAllAtoms() === 0) return { ok: false, error: `${label} contains no atoms.` };
  if (fragment.getFragments().length > 1) {
    return { ok: false, error: `${label} could not be used: search for one connected fragment.` };
  }
  fragment.setFragment(true);
  return { ok: true, fragment, fingerprint: fingerprint(fragment, true), understoodAs: fragment.toSmarts() };
}

/** A stored molecule as the server has it: an openchemlib molecule or its ID code (the structure key). */
export type MoleculeLike = Molecule | string;

function toMolecule(m: MoleculeLike): Molecule {
  // No coordinates: matching does not need them, and skipping them is several times faster.
  return typeof m === "string" ? Molecule.fromIDCode(m, false) : m;
}

/**
 * A reusable exact matcher for one query: build it once per search, then call it on each
 * candidate. An ID code that decodes to nothing (or throws) counts as "no match"; ID codes are
 * otherwise trusted as stored (openchemlib decodes most strings to some molecule).
 */
export function createSubstructureMatcher(query: FragmentQuery): (molecule: MoleculeLike) => boolean {
  const searcher = new SSSearcher();
  searcher.setFragment(query.fragment);
  return (molecule) => {
    let mol: Molecule;
    try {
      mol = toMolecule(molecule);
    } catch {
      return false;
    }
    if (mol.getAllAtoms() === 0) return false;
    searcher.setMolecule(mol);
    return searcher.isFragmentInMolecule();
  };
}

/** One-off exact check: is `fragment` (query or SMILES/SMARTS text) contained in `molecule`? */
export function isSubstructure(fragment: FragmentQuery | string, molecule: MoleculeLike): boolean {
  const query = typeof fragment === "string" ? parseFragmentQuery(fragment) : fragment;
  if (!query.ok) throw new Error(query.error);
  return createSubstructureMatcher(query)(molecule);
}

export interface SearchPageOptions {
  /** Matches to skip (paging). Default 0. */
  offset?: number;
  /** Matches to return. Default 50. */
  limit?: number;
  /** Keep checking after the page is full, to count every match. Default false. */
  countAll?: boolean;
  /** Stop after this much time in the exact check, in ms. Default 800. */
  timeBudgetMs?: number;
}

export interface SearchPage<T> {
  items: T[];
  /** Matches found so far (the total when `complete`). */
  matched: number;
  /** Candidates given the exact check. */
  checked: number;
  /** True when every candidate was checked, so `matched` is the exact total. */
  complete: boolean;
  /** True when the time budget ran out. */
  timedOut: boolean;
}

/**
 * Exact check over the candidates the fingerprint prefilter returned, in the order given (the
 * server decides the ranking, e.g. fewest fingerprint bits first so smaller, closer molecules
 * lead). Stops as soon as the page is full unless `countAll`, and always at the time budget, so a
 * common fragment (benzene matches most of a library) still answers quickly; the caller shows
 * "more than N" when `complete` is false.
 */
export function exactSearchPage<T extends { structureKey: string }>(
  query: FragmentQuery,
  candidates: Iterable<T>,
  options: SearchPageOptions = {},
): SearchPage<T> {
  const offset = Math.max(0, Math.floor(options.offset ?? 0));
  const limit = Math.max(0, Math.floor(options.limit ?? 50));
  const budget = options.timeBudgetMs ?? 800;
  const match = createSubstructureMatcher(query);
  const start = performance.now();
  const items: T[] = [];
  let matched = 0;
  let checked = 0;
  for (const c of candidates) {
    if (!options.countAll && matched >= offset + limit)
      return { items, matched, checked, complete: false, timedOut: false };
    if ((checked & 31) === 0 && performance.now() - start > budget) {
      return { items, matched, checked, complete: false, timedOut: true };
    }
    checked++;
    if (!match(c.structureKey)) continue;
    if (matched >= offset && items.length < limit) items.push(c);
    matched++;
  }
  return { items, matched, checked, complete: true, timedOut: false };
}
