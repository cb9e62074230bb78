/**
 * INVENTED DEMO DATA. About 300 compounds in four invented chemical series for the demo
 * installation, with invented names, supplier codes, suppliers, batches and stock solutions.
 * The scaffolds were drawn for this file from common medicinal-chemistry building blocks (a
 * pyrimidine carboxamide, a benzimidazole sulfonamide, a pyrazole piperidine amide, a quinoline
 * ether) combined with ordinary substituents; they are not taken from any real project, and no
 * activity is implied. Not for reference checks.
 *
 * Deterministic: a seeded generator (mulberry32) picks substituent pairs, batch and stock details,
 * so every call returns the same list.
 */
import type { BatchInput, StockInput } from "./validation";
import { seededUniform as mulberry32 } from "../random";

export interface DemoSeries {
  code: string;
  title: string;
  /** Scaffold as SMILES with {A} and {B} for the substituents (ring labels 8/9 are reserved for them). */
  template: string;
  a: string[];
  b: string[];
}

export interface DemoStock extends StockInput {
  /** Index into the compound's `batches`: the batch the solution was made from. */
  batchIndex: number;
}

export interface DemoCompound {
  series: string;
  /** Invented compound name, e.g. "AP-014". */
  name: string;
  /** Invented supplier codes. */
  aliases: string[];
  smiles: string;
  batches: BatchInput[];
  stocks: DemoStock[];
}

export const DEMO_SERIES: DemoSeries[] = [
  {
    code: "AP",
    title: "Aminopyrimidine carboxamides (invented series)",
    template: "O=C(N{A})c1ccnc(N{B})n1",
    a: [
      "C",
      "CC",
      "C(C)C",
      "C8CC8",
      "CCO",
      "CCOC",
      "C8CCOCC8",
      "Cc8ccccc8",
      "Cc8ccccn8",
      "CC(F)(F)F",
      "C8CCN(C)CC8",
      "CCN8CCOCC8",
    ],
    b: [
      "c8ccccc8",
      "c8ccc(F)cc8",
      "c8ccc(Cl)cc8",
      "c8cccc(OC)c8",
      "c8ccc(C#N)cc8",
      "c8ccncc8",
      "c8cnn(C)c8",
      "c8ccc9OCOc9c8",
    ],
  },
  {
    code: "BS",
    title: "Benzimidazole sulfonamides (invented series)",
    template: "O=S(=O)(N{A})c1ccc2[nH]c({B})nc2c1",
    a: ["C", "CC", "C8CC8", "CCO", "C8CCCC8", "Cc8ccco8", "CC(C)(C)O", "C8CCOC8", "CCC#N", "Cc8ccc(F)cc8"],
    b: ["c8ccccc8", "c8ccc(O)cc8", "c8ccsc8", "c8ccoc8", "C8CC8", "c8ccc(N(C)C)cc8", "c8cccnc8", "C(F)(F)F"],
  },
  {
    code: "PP",
    title: "Pyrazole piperidine amides (invented series)",
    template: "Cn1nc(C(=O)N2CCC({B})CC2)cc1{A}",
    a: [
      "c8ccccc8",
      "c8ccc(F)cc8",
      "c8ccc(Cl)cc8",
      "c8ccc(C)cc8",
      "C8CC8",
      "c8ccccn8",
      "c8ccc(OC(F)(F)F)cc8",
      "c8cc(F)cc(F)c8",
      "C(C)C",
    ],
    b: ["O", "C(N)=O", "Cc8ccccc8", "N8CCCC8", "C(=O)OCC", "CO", "C#N", "F", "c8ccccc8"],
  },
  {
    code: "QE",
    title: "Quinoline 4-ethers (invented series)",
    template: "{A}c1ccc2nccc(O{B})c2c1",
    a: ["C", "F", "Cl", "CO", "N#C", "FC(F)(F)", "COCCO", "NC(=O)", "CS(=O)(=O)"],
    b: [
      "c8ccccc8",
      "c8ccc(F)cc8",
      "c8ccc(NC(C)=O)cc8",
      "c8ccc(C(N)=O)cc8",
      "CC8CC8",
      "C8CCOCC8",
      "Cc8ccccc8",
      "c8ccc(Cl)c(F)c8",
      "CCN8CCCC8",
    ],
  },
];

export const DEMO_COMPOUNDS_PER_SERIES = 75;

/** Invented supplier names. */
export const DEMO_SUPPLIERS = [
  "Fictive Fine Chemicals (invented)",
  "Invented Synthesis Co.",
  "Example Building Blocks (invented)",
  "In-house synthesis",
];

function pick<T>(rand: () => number, items: readonly T[]): T {
  const item = items[Math.floor(rand() * items.length)];
  if (item === undefined) throw new Error("pick from an empty list");
  return item;
}

function isoDay(rand: () => number): string {
  const start = Date.UTC(2025, 0, 6);
  const day = Math.floor(rand() * 170);
  return new Date(start + day * 86_400_000).toISOString().slice(0, 10);
}

const round1 = (x: number) => Math.round(x * 10) / 10;

/** The invented demo compounds, in a fixed order. */
export function demoCompounds(): DemoCompound[] {
  const rand = mulberry32(20250314);
  const out: DemoCompound[] = [];
  let aliasNo = 40100;
  for (const series of DEMO_SERIES) {
    const pairs: [string, string][] = [];
    for (const a of series.a) for (const b of series.b) pairs.push([a, b]);
    // Fisher–Yates shuffle with the seeded generator, then keep the first N.
    for (let i = pairs.length - 1; i > 0; i--) {
      const j = Math.floor(rand() * (i + 1));
      const tmp = pairs[i] as [string, string];
      pairs[i] = pairs[j] as [string, string];
      pairs[j] = tmp;
    }
    pairs.slice(0, DEMO_COMPOUNDS_PER_SERIES).forEach(([a, b], i) => {
      const smiles = series.template.replace("{A}", a).replace("{B}", b);
      const basicAmine = /N8CC|N\(C\)C|CCN8/.test(a + b);
      const batchCount = 1 + Math.floor(rand() * 3);
      const batches: BatchInput[] = [];
      for (let k = 0; k < batchCount; k++) {
        const supplier = pick(rand, DEMO_SUPPLIERS);
        const batch: BatchInput = {
          supplier,
          purityPct: round1(90 + rand() * 9.9),
          amount: Math.round(5 + rand() * 195),
          amountUnit: "mg",
          date: isoDay(rand),
        };
        if (basicAmine && rand() < 0.5) batch.saltForm = pick(rand, ["HCl", "TFA salt"]);
        batches.push(batch);
      }
      const stocks: DemoStock[] = [];
      const stockCount = Math.floor(rand() * 3);
      for (let k = 0; k < stockCount; k++) {
        const batchIndex = Math.floor(rand() * batches.length);
        stocks.push({
          batchIndex,
          concentrationMm: 10,
          solvent: "DMSO",
          volumeUl: pick(rand, [100, 200, 250, 500, 1000]),
          location: `Freezer ${1 + Math.floor(rand() * 3)} / Rack ${pick(rand, ["A", "B", "C", "D", "E", "F"])} / ${pick(rand, ["A", "B", "C", "D", "E", "F", "G", "H"])}${String(1 + Math.floor(rand() * 12)).padStart(2, "0")}`,
          date: batches[batchIndex]?.date,
        });
      }
      const aliases = [`IVC-${aliasNo++}`];
      if (rand() < 0.2) aliases.push(`EXB-${Math.floor(rand() * 90000) + 10000}`);
      out.push({
        series: series.code,
        name: `${series.code}-${String(i + 1).padStart(3, "0")}`,
        aliases,
        smiles,
        batches,
        stocks,
      });
    });
  }
  return out;
}
