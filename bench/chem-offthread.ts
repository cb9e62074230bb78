/**
 * Benchmark (not a test): what the server's event loop feels while the chemistry worker pool
 * prepares, draws and searches large structures. Goal (hardening issue): a trivial request is
 * answered within 1 s meanwhile; here the event loop's largest delay stands for it (a 10 ms
 * interval timer's lateness). Structures are INVENTED (Gly-Leu repeats and alkyl ethers chosen for
 * their size). Before the pool, a 1,600–2,000-character SMILES held the event loop 7–11 s.
 */
import { performance } from "node:perf_hooks";
import { runChem } from "@/server/services/compounds/prepare-pool";
import { structureSvgs } from "@/server/services/compounds/drawings";

const UNIT = "CC(=O)N[C@@H](CC(C)C)C(=O)N";
const peptide = (n: number) => `N${UNIT.repeat(n)}CC(=O)O`;

async function measured<T>(label: string, work: () => Promise<T>): Promise<T> {
  let maxLag = 0;
  let last = performance.now();
  const probe = setInterval(() => {
    const now = performance.now();
    maxLag = Math.max(maxLag, now - last - 10);
    last = now;
  }, 10);
  const t0 = performance.now();
  try {
    return await work();
  } finally {
    clearInterval(probe);
    console.log(`| ${label} | ${(performance.now() - t0).toFixed(0)} ms | ${maxLag.toFixed(0)} ms |`);
  }
}

type Prepared = { ok: boolean; error?: string; properties?: { structureKey: string; heavyAtomCount: number } };

async function main() {
  console.log("| task (in the worker pool) | wall time | largest event-loop delay |\n|---|---|---|");
  await measured("start the pool and prepare ethanol (cold)", () =>
    runChem({ kind: "prepare", input: { smiles: "CCO" } }, "warm-up"),
  );
  const big = await measured("prepare a 341-heavy-atom peptide with stereo marks", () =>
    runChem<Prepared>({ kind: "prepare", input: { smiles: peptide(28) } }, "bench"),
  );
  await measured("refuse a valid 1,900-atom chain SMILES (size cap)", () =>
    runChem<Prepared>({ kind: "prepare", input: { smiles: "C".repeat(1900) } }, "bench"),
  );
  if (big.properties)
    await measured("draw it at 640 × 480", () =>
      structureSvgs([big.properties!.structureKey], { width: 640, height: 480 }),
    );
  const keys: string[] = [];
  for (let i = 0; i < 200; i++) {
    const r = await runChem<Prepared>(
      { kind: "prepare", input: { smiles: `${"C".repeat(1 + (i % 12))}Oc1ccc(cc1)C(=O)N${"C".repeat(1 + (i % 7))}` } },
      "bench",
    );
    if (r.properties) keys.push(r.properties.structureKey);
  }
  await measured(`draw ${keys.length} grid thumbnails (cold)`, () =>
    structureSvgs(keys, { width: 120, height: 90, idPrefix: "t-" }),
  );
  await measured(`the same ${keys.length} thumbnails again (cache)`, () =>
    structureSvgs(keys, { width: 120, height: 90, idPrefix: "t-" }),
  );
  await measured("a generic 41-atom substructure query over those structures", () =>
    runChem(
      {
        kind: "search",
        text: `${"[!#1]~".repeat(40)}[!#1]`,
        candidates: keys.map((k, i) => ({ id: String(i), structureKey: k })),
        options: { limit: 50, countAll: true, timeBudgetMs: 800 },
      },
      "bench",
      6000,
    ),
  );
  process.exit(0);
}

void main();
