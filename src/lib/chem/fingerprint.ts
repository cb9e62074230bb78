/**
 * Substructure-screening fingerprint: 1024 bits, such that if fragment F is a substructure of
 * molecule M then every bit set in fp(F) is set in fp(M). The database keeps only molecules whose
 * bits include all of the fragment's bits; the exact check (`substructure.ts`) runs on those.
 *
 * Why not openchemlib's own index (SSSearcherWithIndex, 512 key fragments): measured here it costs
 * about 10 ms per drug-sized molecule (100 s for a 10,000-record import on one core), which breaks
 * the import budget of 30 s. This fingerprint costs well under 1 ms and is checked for soundness
 * against openchemlib's exact matcher in the tests (no false negatives on hundreds of
 * fragment/molecule pairs).
 *
 * Features (the idea of hashed path fingerprints is common practice in chemical databases):
 * - every simple path of 1–7 heavy atoms, labelled by atomic numbers only, read in the
 *   lexicographically smaller direction;
 * - every simple cycle of 3–7 atoms, labelled by atomic numbers, canonical over rotation and
 *   reflection;
 * - "at least k atoms of element Z" for k = 2..8;
 * - each triple bond with its two elements (a plain triple bond in a fragment matches only a
 *   triple bond).
 * Each feature string is hashed (FNV-1a, 32 bit) to one of 1024 bits.
 *
 * Soundness: a substructure match maps fragment atoms injectively onto molecule atoms of the same
 * element and fragment bonds onto molecule bonds, so every fragment path, cycle and element count
 * exists in the molecule. Other bond orders and aromaticity are deliberately not encoded, because
 * openchemlib's matcher lets e.g. a Kekulé double bond match an aromatic bond. Query atoms that are
 * not one plain element (atom lists, `*`, `[!#6]`) and bridge bonds are left out of the fragment's
 * features (they can only make the fragment's bit set smaller, never unsound).
 *
 * Storage proposal for Postgres: a `bit(1024)` column holding `toBitString(fp)` ('0'/'1', bit 0
 * first), filtered with
 *     WHERE (fp & $1::bit(1024)) = $1::bit(1024)
 * where $1 is the fragment's bit string. A sequential scan of 100,000 rows of 128 bytes is cheap;
 * no index type helps this predicate. `popcount(fp)` (`bitCount`) may be stored beside it to rank
 * smaller molecules first.
 */
import type { Molecule } from "openchemlib";

export const FINGERPRINT_BITS = 1024;
const WORDS = FINGERPRINT_BITS / 32;
/** Longest path, in atoms. Also the largest ring size recorded. */
export const MAX_PATH_ATOMS = 7;
const MAX_COUNT_FEATURE = 8;

/** 1024 bits as 32 unsigned 32-bit words; bit i is (words[i >> 5] >>> (i & 31)) & 1. */
export type Fingerprint = Uint32Array;

function fnv1a(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

function setFeature(fp: Fingerprint, feature: string): void {
  const bit = fnv1a(feature) % FINGERPRINT_BITS;
  fp[bit >>> 5] = (fp[bit >>> 5] ?? 0) | (1 << (bit & 31));
}

/** Atomic number for a plain atom; -1 for a query atom that is not one definite element. */
function atomLabel(mol: Molecule, atom: number, isQuery: boolean): number {
  const z = mol.getAtomicNo(atom);
  if (!isQuery) return z;
  const list = mol.getAtomList(atom);
  if (list !== null && list !== undefined) return -1;
  // A wildcard (`*`, `A`, `a`) reports atomic number 6 with an empty atom-list string.
  if (mol.getAtomListString(atom) !== mol.getAtomLabel(atom)) return -1;
  return z;
}

function pathKey(labels: number[]): string {
  const fwd = labels.join(".");
  const rev = labels.slice().reverse().join(".");
  return fwd < rev ? fwd : rev;
}

function cycleKey(labels: number[]): string {
  const n = labels.length;
  let best: string | undefined;
  for (const seq of [labels, labels.slice().reverse()]) {
    for (let r = 0; r < n; r++) {
      const s = seq.slice(r).concat(seq.slice(0, r)).join(".");
      if (best === undefined || s < best) best = s;
    }
  }
  return best ?? "";
}

/**
 * The screening fingerprint of a molecule, or of a query fragment when `isQuery` is true
 * (openchemlib fragments from `parseFragmentQuery` set this automatically via `isFragment()`).
 */
export function fingerprint(mol: Molecule, isQuery: boolean = mol.isFragment()): Fingerprint {
  mol.ensureHelperArrays(1); // cHelperNeighbours
  const fp: Fingerprint = new Uint32Array(WORDS);
  const n = mol.getAllAtoms();
  const labels: number[] = new Array<number>(n);
  const adj: number[][] = [];
  for (let a = 0; a < n; a++) {
    labels[a] = mol.getAtomicNo(a) > 1 ? atomLabel(mol, a, isQuery) : -1;
    adj.push([]);
  }
  for (let b = 0; b < mol.getAllBonds(); b++) {
    if (isQuery && mol.isBondBridge(b)) continue;
    const a1 = mol.getBondAtom(0, b);
    const a2 = mol.getBondAtom(1, b);
    if ((labels[a1] ?? -1) < 0 || (labels[a2] ?? -1) < 0) continue;
    adj[a1]?.push(a2);
    adj[a2]?.push(a1);
  }

  // Triple bonds: a plain fragment triple bond only ever matches a triple bond (openchemlib),
  // so this feature is sound; it separates nitriles and alkynes from every C–N / C–C.
  for (let b = 0; b < mol.getAllBonds(); b++) {
    if (mol.getBondOrder(b) !== 3 || (isQuery && mol.getBondQueryFeatures(b) !== 0)) continue;
    const z1 = labels[mol.getBondAtom(0, b)] ?? -1;
    const z2 = labels[mol.getBondAtom(1, b)] ?? -1;
    if (z1 > 0 && z2 > 0) setFeature(fp, `T${Math.min(z1, z2)}.${Math.max(z1, z2)}`);
  }

  const counts = new Map<number, number>();
  for (const z of labels) if (z > 0) counts.set(z, (counts.get(z) ?? 0) + 1);
  for (const [z, c] of counts) {
    for (let k = 2; k <= Math.min(c, MAX_COUNT_FEATURE); k++) setFeature(fp, `E${z}x${k}`);
  }

  const onPath = new Uint8Array(n);
  const path: number[] = [];
  const pathLabels: number[] = [];
  const visit = (atom: number, start: number): void => {
    path.push(atom);
    pathLabels.push(labels[atom] ?? -1);
    onPath[atom] = 1;
    setFeature(fp, `P${pathKey(pathLabels)}`);
    const neighbours = adj[atom] ?? [];
    if (path.length >= 3 && neighbours.includes(start)) setFeature(fp, `R${cycleKey(pathLabels)}`);
    if (path.length < MAX_PATH_ATOMS) {
      for (const next of neighbours) if (!onPath[next]) visit(next, start);
    }
    onPath[atom] = 0;
    path.pop();
    pathLabels.pop();
  };
  for (let a = 0; a < n; a++) if ((labels[a] ?? -1) > 0) visit(a, a);
  return fp;
}

/** True when every bit of `fragment` is set in `molecule` (the prefilter, in memory). */
export function fingerprintContains(molecule: Fingerprint, fragment: Fingerprint): boolean {
  for (let i = 0; i < WORDS; i++) {
    const f = fragment[i] ?? 0;
    if (((molecule[i] ?? 0) & f) >>> 0 !== f) return false;
  }
  return true;
}

/** Number of set bits. */
export function bitCount(fp: Fingerprint): number {
  let c = 0;
  for (let i = 0; i < WORDS; i++) {
    let v = fp[i] ?? 0;
    v = v - ((v >>> 1) & 0x55555555);
    v = (v & 0x33333333) + ((v >>> 2) & 0x33333333);
    c += (Math.imul((v + (v >>> 4)) & 0x0f0f0f0f, 0x01010101) >>> 24) & 0xff;
  }
  return c;
}

/** Tanimoto coefficient |A∧B| / |A∨B| (Willett, J. Chem. Inf. Comput. Sci. 1998); 0 for two empty sets. */
export function tanimoto(a: Fingerprint, b: Fingerprint): number {
  let both = 0;
  let either = 0;
  for (let i = 0; i < WORDS; i++) {
    const x = a[i] ?? 0;
    const y = b[i] ?? 0;
    both += bitCount(Uint32Array.of(x & y));
    either += bitCount(Uint32Array.of(x | y));
  }
  return either === 0 ? 0 : both / either;
}

/** '0'/'1' string of length 1024, bit 0 first: the literal for a Postgres `bit(1024)` value. */
export function toBitString(fp: Fingerprint): string {
  let s = "";
  for (let i = 0; i < FINGERPRINT_BITS; i++) s += ((fp[i >>> 5] ?? 0) >>> (i & 31)) & 1 ? "1" : "0";
  return s;
}

export function fromBitString(bits: string): Fingerprint {
  if (bits.length !== FINGERPRINT_BITS || /[^01]/.test(bits)) {
    throw new Error(`A fingerprint bit string must be ${FINGERPRINT_BITS} characters of 0 and 1.`);
  }
  const fp: Fingerprint = new Uint32Array(WORDS);
  for (let i = 0; i < FINGERPRINT_BITS; i++) {
    if (bits.charCodeAt(i) === 49) fp[i >>> 5] = (fp[i >>> 5] ?? 0) | (1 << (i & 31));
  }
  return fp;
}

/** 256 hex characters, for JSON or a `bytea` column (`decode($1, 'hex')`); bit order as in toBitString. */
export function toHex(fp: Fingerprint): string {
  let s = "";
  for (let i = 0; i < FINGERPRINT_BITS; i += 4) {
    let nibble = 0;
    for (let j = 0; j < 4; j++) nibble = (nibble << 1) | (((fp[(i + j) >>> 5] ?? 0) >>> ((i + j) & 31)) & 1);
    s += nibble.toString(16);
  }
  return s;
}

export function fromHex(hex: string): Fingerprint {
  if (hex.length !== FINGERPRINT_BITS / 4 || /[^0-9a-fA-F]/.test(hex)) {
    throw new Error(`A fingerprint hex string must be ${FINGERPRINT_BITS / 4} hexadecimal characters.`);
  }
  let bits = "";
  for (const ch of hex) bits += parseInt(ch, 16).toString(2).padStart(4, "0");
  return fromBitString(bits);
}
