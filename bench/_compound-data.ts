/**
 * INVENTED molecules for the compound benchmarks only (not demo data, not reference data): a
 * seeded generator joins drug-like building blocks into SMILES, so every run times the same set.
 */
import { seededUniform as mulberry32 } from "../src/lib/random";

export { mulberry32 };

const HEADS = [
  "C",
  "CC",
  "FC(F)(F)",
  "N#C",
  "CO",
  "CN(C)",
  "O=C(O)",
  "Cl",
  "F",
  "c8ccccc8",
  "C8CC8",
  "C8CCOCC8",
  "o8cccc8",
];
const CORES = [
  "c8ccc(cc8)",
  "c8cccc(c8)",
  "c8ccc(nc8)",
  "c8ccc(s8)",
  "C8CCN(CC8)",
  "N8CCN(CC8)",
  "c8cnc(nc8)",
  "c8ccc9[nH]ccc9c8",
  "c8ccc9ncccc9c8",
  "c8cn(C)nc8",
];
const LINKS = ["", "C", "CC", "C(=O)N", "NC(=O)", "O", "S(=O)(=O)N", "N", "C(=O)", "OC", "NC(=O)N", "C#C"];
const TAILS = [
  "C",
  "F",
  "Cl",
  "OC",
  "C(F)(F)F",
  "C#N",
  "N(C)C",
  "C(=O)O",
  "O",
  "c8ccccc8",
  "C8CC8",
  "N8CCOCC8",
  "C(N)=O",
  "S(C)(=O)=O",
];

/** `count` distinct invented SMILES strings. */
export function inventedSmiles(count: number, seed = 11): string[] {
  const rand = mulberry32(seed);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)] as T;
  const seen = new Set<string>();
  while (seen.size < count) {
    const two = rand() < 0.6;
    const s =
      pick(HEADS) + pick(LINKS) + pick(CORES) + pick(LINKS) + (two ? pick(CORES) + pick(LINKS) : "") + pick(TAILS);
    seen.add(s);
  }
  return [...seen];
}

export const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? (s[m] ?? 0) : ((s[m - 1] ?? 0) + (s[m] ?? 0)) / 2;
};

/** The substructure queries both search benchmarks time (common medicinal-chemistry fragments). */
export const SEARCH_FRAGMENTS = [
  "c1ccccc1",
  "c1ccncc1",
  "C(=O)N",
  "S(=O)(=O)N",
  "C(F)(F)F",
  "N1CCNCC1",
  "C1CCNCC1",
  "c1ccc2[nH]ccc2c1",
  "c1ccsc1",
  "C#N",
  "NC(=O)N",
  "c1ccc(cc1)C(=O)N",
  "C1CC1",
  "N1CCOCC1",
  "c1ncncc1",
  "[F,Cl]c1ccccc1",
  "OC(=O)c1ccccc1",
  "c1ccc2ncccc2c1",
  "CN(C)c1ccccc1",
  "c1ccco1",
];
