/**
 * The committed fixture set (fixtures/plates/): INVENTED reader exports of every shape with their
 * plate maps and true parameters, plus deliberately bad files with the exact message each must
 * produce. Pure: returns file contents; src/cli/fixtures.ts writes them.
 */
import {
  compoundId,
  DEMO_ENZYME,
  DEMO_NOTE,
  DEMO_SUBSTRATE_UM,
  inhibitorSeries,
  MECHANISM_SUBSTRATE_UM,
  SPECIAL_COMPOUNDS,
} from "./demo-campaign";
import { type GridRead, writeGridText, writeGridXlsx, writeLongEndpoint, writeLongKinetic } from "./export-writers";
import type { PlateFormat } from "./geometry";
import { doseResponseLayout, mechanismLayout, singleDoseCapacity, singleDoseLayout } from "./layouts";
import { plateMapToCsv, type PlateMap } from "./plate-map";
import type { ExportShape } from "./reader-export";
import {
  type CompoundTruth,
  deriveSeed,
  type EndpointAssay,
  expectedZPrime,
  fractionalActivity,
  type KineticAssay,
  simulateEndpointPlate,
  simulateKineticPlate,
  trueIc50Um,
} from "./simulate";

export interface FixtureFile {
  /** path inside fixtures/plates/ */
  readonly path: string;
  readonly contents: string | Uint8Array;
}

export interface GoodFixture {
  readonly file: string;
  readonly map: string;
  readonly shape: ExportShape;
  readonly format: PlateFormat;
  readonly reads: number;
  readonly wells: number;
  readonly description: string;
  readonly truth: Record<string, unknown>;
}

export interface BadFixture {
  readonly file: string;
  /** what to parse it as, and with which plate format (the plate map's) */
  readonly parseAs: "reader-export" | "plate-map";
  readonly format?: PlateFormat;
  readonly case: string;
  /** the first message, as `PlateIssue.text` with the file's base name */
  readonly error: string;
}

export interface FixtureSet {
  readonly files: FixtureFile[];
  readonly good: GoodFixture[];
  readonly bad: BadFixture[];
  readonly truthJson: string;
  readonly readme: string;
}

export const FIXTURE_SEED = 20240601;

const ENDPOINT: EndpointAssay = {
  neutralSignal: 12000,
  fullSignal: 1500,
  noiseSd: 150,
  noiseCvPct: 4,
  substrateUm: DEMO_SUBSTRATE_UM,
  enzyme: DEMO_ENZYME,
  decimals: 0,
};

const ABSORBANCE: EndpointAssay = {
  neutralSignal: 1.2,
  fullSignal: 0.08,
  noiseSd: 0.02,
  noiseCvPct: 2,
  substrateUm: DEMO_SUBSTRATE_UM,
  enzyme: DEMO_ENZYME,
  decimals: 4,
};

function compoundRecord(c: CompoundTruth): Record<string, unknown> {
  return { ...c, ic50AtAssayUm: trueIc50Um(c, DEMO_SUBSTRATE_UM, DEMO_ENZYME.kmUm) ?? null };
}

function inhibitionTable(map: PlateMap, byId: ReadonlyMap<string, CompoundTruth>): Record<string, number> {
  const out: Record<string, number> = {};
  for (const w of map.wells) {
    if (w.role !== "sample" || !w.compound) continue;
    const c = byId.get(w.compound);
    if (c)
      out[w.well] = Number(
        (
          100 *
          (1 - fractionalActivity(c, w.concentrationUm ?? 0, w.substrateUm ?? DEMO_SUBSTRATE_UM, DEMO_ENZYME))
        ).toFixed(3),
      );
  }
  return out;
}

function endpointReads(values: ReadonlyMap<string, number>): GridRead[] {
  return [{ values }];
}

function kineticReads(timesS: readonly number[], wells: ReadonlyMap<string, readonly number[]>): GridRead[] {
  return timesS.map((timeS, k) => ({ timeS, values: new Map([...wells].map(([w, s]) => [w, s[k]!])) }));
}

const INVENTED_HEADER = "Invented example export (simulated; not from an instrument)";

/** Build every fixture file in memory. */
export async function buildFixtureSet(seed = FIXTURE_SEED): Promise<FixtureSet> {
  const files: FixtureFile[] = [];
  const good: GoodFixture[] = [];
  const bad: BadFixture[] = [];
  const add = (path: string, contents: string | Uint8Array) => files.push({ path, contents });

  // A small library: the six special compounds plus invented logistic inhibitors and inactives.
  const library: CompoundTruth[] = [...SPECIAL_COMPOUNDS];
  for (let n = 7; n <= 1500; n++) {
    const id = compoundId(n);
    library.push(
      n % 37 === 0
        ? { id, kind: "logistic", ic50Um: Number((0.1 * 1.3 ** (n % 29)).toPrecision(3)), hill: 1 }
        : { id, kind: "inactive" },
    );
  }
  const byId = new Map(library.map((c) => [c.id, c]));
  const ref = { referenceCompound: compoundId(1), referenceConcentrationUm: 100 };

  // 1. Single-dose, 96 wells, the same read as a long table and as a grid.
  {
    const ids = library.slice(0, singleDoseCapacity(96, 1)).map((c) => c.id);
    const map = singleDoseLayout(96, ids, 10, 1, ref);
    const values = simulateEndpointPlate(map, byId, ENDPOINT, deriveSeed(seed, 1));
    add("single-dose-96.map.csv", plateMapToCsv(map));
    add("single-dose-96.long.csv", writeLongEndpoint(values, { notes: [INVENTED_HEADER] }));
    add("single-dose-96.grid.csv", writeGridText(96, endpointReads(values), { notes: [INVENTED_HEADER] }));
    const truth = {
      assay: ENDPOINT,
      expectedZPrime: expectedZPrime(ENDPOINT),
      inhibitionPct: inhibitionTable(map, byId),
    };
    const d =
      "single-dose screen at 10 µM, one well per compound; the .long.csv and .grid.csv files hold the same read";
    good.push({
      file: "single-dose-96.long.csv",
      map: "single-dose-96.map.csv",
      shape: "long-endpoint",
      format: 96,
      reads: 1,
      wells: 96,
      description: d,
      truth,
    });
    good.push({
      file: "single-dose-96.grid.csv",
      map: "single-dose-96.map.csv",
      shape: "grid-endpoint",
      format: 96,
      reads: 1,
      wells: 96,
      description: d,
      truth,
    });
  }

  // 2. Single-dose, 1536 wells, grid, with an edge effect.
  {
    const ids = library.slice(0, singleDoseCapacity(1536, 1)).map((c) => c.id);
    const map = singleDoseLayout(1536, ids, 10, 1, ref);
    const assay = { ...ENDPOINT, edgeLossPct: 20 };
    const values = simulateEndpointPlate(map, byId, assay, deriveSeed(seed, 2));
    add("single-dose-1536.map.csv", plateMapToCsv(map));
    add("single-dose-1536.grid.csv", writeGridText(1536, endpointReads(values), { notes: [INVENTED_HEADER] }));
    good.push({
      file: "single-dose-1536.grid.csv",
      map: "single-dose-1536.map.csv",
      shape: "grid-endpoint",
      format: 1536,
      reads: 1,
      wells: 1536,
      description: "single-dose screen at 10 µM on 1536 wells; the outer ring reads 20 % low (edge effect)",
      truth: {
        assay,
        expectedZPrimeWithoutEdge: expectedZPrime(ENDPOINT),
        edgeLossPct: 20,
        inhibitionPct: inhibitionTable(map, byId),
      },
    });
  }

  // 3. Dose-response, 384 wells, grid CSV: specials (tight binder, partial inhibitor) and logistic hits.
  {
    const chosen = [
      ...SPECIAL_COMPOUNDS,
      ...library.filter((c) => c.kind === "logistic" && !SPECIAL_COMPOUNDS.includes(c)),
    ].slice(0, 16);
    const series = chosen.map((c) => ({ compound: c.id, topConcentrationUm: c.kind === "tight-binding" ? 1 : 100 }));
    const map = doseResponseLayout(384, series, { points: 10, dilutionFactor: 3, replicates: 2 }, ref);
    const values = simulateEndpointPlate(map, byId, ENDPOINT, deriveSeed(seed, 3));
    add("dose-response-384.map.csv", plateMapToCsv(map));
    add("dose-response-384.grid.csv", writeGridText(384, endpointReads(values), { notes: [INVENTED_HEADER] }));
    good.push({
      file: "dose-response-384.grid.csv",
      map: "dose-response-384.map.csv",
      shape: "grid-endpoint",
      format: 384,
      reads: 1,
      wells: 384,
      description: "dose-response, 10 points 1:3 from 100 µM (1 µM for the tight binder), duplicate rows, S = Km",
      truth: {
        assay: ENDPOINT,
        expectedZPrime: expectedZPrime(ENDPOINT),
        substrateUm: DEMO_SUBSTRATE_UM,
        enzyme: DEMO_ENZYME,
        compounds: chosen.map(compoundRecord),
      },
    });
  }

  // 4. Dose-response, 96 wells, TSV grid, absorbance-like values with decimals.
  {
    const chosen = [
      SPECIAL_COMPOUNDS[5]!,
      SPECIAL_COMPOUNDS[2]!,
      ...library.filter((c) => c.kind === "logistic").slice(0, 2),
    ];
    const series = chosen.map((c) => ({ compound: c.id, topConcentrationUm: 100 }));
    const map = doseResponseLayout(96, series, { points: 8, dilutionFactor: 3, replicates: 2 });
    const values = simulateEndpointPlate(map, byId, ABSORBANCE, deriveSeed(seed, 4));
    add("dose-response-96.map.csv", plateMapToCsv(map));
    add(
      "dose-response-96.tsv",
      writeGridText(96, endpointReads(values), { delimiter: "\t", notes: [INVENTED_HEADER] }),
    );
    good.push({
      file: "dose-response-96.tsv",
      map: "dose-response-96.map.csv",
      shape: "grid-endpoint",
      format: 96,
      reads: 1,
      wells: 96,
      description: "dose-response in TSV, 8 points 1:3 from 100 µM, duplicate rows, absorbance-like signal",
      truth: { assay: ABSORBANCE, expectedZPrime: expectedZPrime(ABSORBANCE), compounds: chosen.map(compoundRecord) },
    });
  }

  // 5. Mechanism study, 96 wells, long kinetic CSV: one competitive compound.
  const kinetic96: KineticAssay = {
    enzyme: DEMO_ENZYME,
    defaultSubstrateUm: DEMO_SUBSTRATE_UM,
    timesS: Array.from({ length: 31 }, (_, k) => k * 20),
    gainPerUm: 500,
    baseline: 200,
    noiseSd: 3,
    depletion: true,
    decimals: 1,
  };
  {
    const c = SPECIAL_COMPOUNDS[0]!;
    const map = mechanismLayout(
      96,
      [{ compound: c.id, inhibitorUm: inhibitorSeries(c) }],
      [5, 10, 15, 20, 30, 40, 80, 160],
      2,
      { substrateUm: DEMO_SUBSTRATE_UM },
    );
    const sim = simulateKineticPlate(map, byId, kinetic96, deriveSeed(seed, 5));
    add("mechanism-96.map.csv", plateMapToCsv(map));
    add("mechanism-96.long-kinetic.csv", writeLongKinetic(kinetic96.timesS, sim.wells, { notes: [INVENTED_HEADER] }));
    good.push({
      file: "mechanism-96.long-kinetic.csv",
      map: "mechanism-96.map.csv",
      shape: "long-kinetic",
      format: 96,
      reads: kinetic96.timesS.length,
      wells: sim.wells.size,
      description:
        "mechanism study of a competitive inhibitor: 8 substrate × 4 inhibitor concentrations in duplicate, 31 reads every 20 s",
      truth: {
        assay: kinetic96,
        compounds: [compoundRecord(c)],
        initialRatePerS: Object.fromEntries([...sim.truth].map(([w, t]) => [w, t.initialRatePerS])),
      },
    });
  }

  // 6. Mechanism study, 384 wells, XLSX kinetic grids: all four mechanisms.
  {
    const specials = SPECIAL_COMPOUNDS.slice(0, 4);
    const assay: KineticAssay = { ...kinetic96, timesS: Array.from({ length: 40 }, (_, k) => k * 15) };
    const map = mechanismLayout(
      384,
      specials.map((c) => ({ compound: c.id, inhibitorUm: inhibitorSeries(c) })),
      MECHANISM_SUBSTRATE_UM,
      2,
      { substrateUm: DEMO_SUBSTRATE_UM },
    );
    const sim = simulateKineticPlate(map, byId, assay, deriveSeed(seed, 6));
    add("mechanism-384.map.csv", plateMapToCsv(map));
    add(
      "mechanism-384.grid-kinetic.xlsx",
      await writeGridXlsx(384, kineticReads(assay.timesS, sim.wells), { notes: [INVENTED_HEADER] }),
    );
    good.push({
      file: "mechanism-384.grid-kinetic.xlsx",
      map: "mechanism-384.map.csv",
      shape: "grid-kinetic",
      format: 384,
      reads: assay.timesS.length,
      wells: sim.wells.size,
      description:
        "mechanism study of four compounds (competitive, uncompetitive, noncompetitive, mixed): 10 substrate × 4 inhibitor concentrations in duplicate, 40 reads every 15 s",
      truth: {
        assay,
        compounds: specials.map(compoundRecord),
        initialRatePerS: Object.fromEntries([...sim.truth].map(([w, t]) => [w, t.initialRatePerS])),
      },
    });
  }

  // 7. Substrate depletion: the 96-well mechanism map with a tenfold faster enzyme, as CSV grids.
  {
    const c = SPECIAL_COMPOUNDS[0]!;
    const assay: KineticAssay = { ...kinetic96, enzyme: { ...DEMO_ENZYME, vmaxUmPerS: 0.02 } };
    const map = mechanismLayout(
      96,
      [{ compound: c.id, inhibitorUm: inhibitorSeries(c) }],
      [5, 10, 15, 20, 30, 40, 80, 160],
      2,
      { substrateUm: DEMO_SUBSTRATE_UM },
    );
    const sim = simulateKineticPlate(map, byId, assay, deriveSeed(seed, 7));
    const last = assay.timesS[assay.timesS.length - 1]!;
    add(
      "depletion-96.grid-kinetic.csv",
      writeGridText(96, kineticReads(assay.timesS, sim.wells), { notes: [INVENTED_HEADER] }),
    );
    good.push({
      file: "depletion-96.grid-kinetic.csv",
      map: "mechanism-96.map.csv",
      shape: "grid-kinetic",
      format: 96,
      reads: assay.timesS.length,
      wells: sim.wells.size,
      description: `progress curves that bend: Vmax ten times higher, so wells at low substrate use up well over 10 % of it by ${last} s (initial-rate conditions broken late in the run)`,
      truth: {
        assay,
        compounds: [compoundRecord(c)],
        initialRatePerS: Object.fromEntries([...sim.truth].map(([w, t]) => [w, t.initialRatePerS])),
        substrateConvertedPctAtEnd: Object.fromEntries(
          [...sim.wells]
            .filter(([w]) => sim.truth.get(w)!.initialRatePerS > 0)
            .map(([w, s]) => [
              w,
              Number(
                ((100 * (s[s.length - 1]! - assay.baseline)) / assay.gainPerUm / sim.truth.get(w)!.sUm).toFixed(1),
              ),
            ]),
        ),
      },
    });
  }

  // ------------------------------------------------------------ bad files
  const grid96 = (v: (r: number, c: number) => string) => {
    const rows = [["", ...Array.from({ length: 12 }, (_, c) => String(c + 1))].join(",")];
    for (let r = 0; r < 8; r++)
      rows.push([String.fromCharCode(65 + r), ...Array.from({ length: 12 }, (_, c) => v(r, c))].join(","));
    return rows;
  };
  const badExport = (
    file: string,
    contents: string | Uint8Array,
    kase: string,
    error: string,
    format?: PlateFormat,
  ) => {
    add(`bad/${file}`, contents);
    bad.push({ file: `bad/${file}`, parseAs: "reader-export", ...(format ? { format } : {}), case: kase, error });
  };
  badExport("empty.csv", "", "empty file", "empty.csv: file is empty");
  const garbage = new Uint8Array(2048);
  for (let i = 0; i < garbage.length; i++) garbage[i] = (i * 131 + 7) % 256;
  badExport(
    "garbage.csv",
    garbage,
    "binary garbage",
    "garbage.csv: file is not a CSV, TSV or XLSX export (it looks like binary data)",
  );
  badExport(
    "no-plate-data.csv",
    "These are notes,\nnot a plate\n",
    "text with no table or grid",
    'no-plate-data.csv: no plate data found: expected a header row "well,value" or "well,time_s,value", or a plate grid with column numbers 1–12, 1–24 or 1–48 across and row letters down',
  );
  {
    const rows = [["", ...Array.from({ length: 12 }, (_, c) => String(c + 1))].join(",")];
    for (let r = 0; r < 10; r++)
      rows.push([String.fromCharCode(65 + r), ...Array.from({ length: 12 }, () => "100")].join(","));
    badExport(
      "wrong-size-grid.csv",
      rows.join("\n") + "\n",
      "grid that is no plate size (10 × 12)",
      "wrong-size-grid.csv line 1: plate grid has 10 rows × 12 columns; a plate has 8 × 12, 16 × 24 or 32 × 48",
    );
  }
  {
    const rows = [["", ...Array.from({ length: 24 }, (_, c) => String(c + 1))].join(",")];
    for (let r = 0; r < 16; r++)
      rows.push([String.fromCharCode(65 + r), ...Array.from({ length: 24 }, () => "100")].join(","));
    badExport(
      "grid-384-for-96-map.csv",
      rows.join("\n") + "\n",
      "384-well grid uploaded for a 96-well plate map",
      "grid-384-for-96-map.csv line 1: plate grid is 16 × 24 (384-well) but the plate map is 96-well (8 × 12)",
      96,
    );
  }
  badExport(
    "well-off-plate.csv",
    "well,value\nA1,100\nP24,100\n",
    "long table with a well outside the plate map's format",
    'well-off-plate.csv line 3: "P24" is not a well of a 96-well plate',
    96,
  );
  badExport(
    "duplicate-wells.csv",
    "well,value\nA1,100\nB3,120\nb03,130\n",
    "the same well twice",
    "duplicate-wells.csv line 4, well B3: well is listed twice (first on line 3)",
  );
  badExport(
    "duplicate-kinetic-point.csv",
    "well,time_s,value\nA1,0,100\nA1,30,110\nA1,30,111\n",
    "the same well and time twice",
    "duplicate-kinetic-point.csv line 4, well A1: time 30 s is listed twice for this well (first on line 3)",
  );
  badExport(
    "non-numeric.csv",
    grid96((r, c) => (r === 1 && c === 2 ? "abc" : "100")).join("\n") + "\n",
    "non-numeric cell",
    'non-numeric.csv line 3, well B3: "abc" is not a number',
  );
  badExport(
    "formula-injection.csv",
    'well,value\nA1,100\nA2,"=HYPERLINK(""http://example.invalid"",""x"")"\n',
    "text starting with =",
    'formula-injection.csv line 3: "=HYPERLINK(\\"http://example.invalid\\",\\"x\\")" starts with "=", which a spreadsheet may run as a formula; text like this is refused',
  );
  badExport(
    "formula-injection-at.csv",
    "well,value\n@A1,100\n",
    "text starting with @",
    'formula-injection-at.csv line 2: "@A1" starts with "@", which a spreadsheet may run as a formula; text like this is refused',
  );
  badExport(
    "too-many-reads.csv",
    ["well,time_s,value", ...Array.from({ length: 501 }, (_, k) => `A1,${k * 10},${100 + k}`)].join("\n") + "\n",
    "501 reads",
    "too-many-reads.csv line 502, well A1: file has more than 500 reads (distinct times); the limit is 500",
  );
  badExport(
    "grids-without-times.csv",
    [...grid96(() => "100"), "", ...grid96(() => "110")].join("\n") + "\n",
    "two grids and no read times",
    'grids-without-times.csv line 1: file has 2 plate grids, and this one has no read time above it; write e.g. "Time (s): 30" on the line above each grid',
  );

  const badMap = (file: string, body: string[], kase: string, error: string) => {
    const controls = ["A1", "B1", "C1", "D1"]
      .map((w) => `${w},neutral,,,,`)
      .concat(["E1", "F1", "G1", "H1"].map((w) => `${w},full,,,,`));
    add(
      `bad/${file}`,
      ["well,role,compound,concentration_uM,substrate_uM,group", ...controls, ...body].join("\n") + "\n",
    );
    bad.push({ file: `bad/${file}`, parseAs: "plate-map", format: 96, case: kase, error });
  };
  badMap(
    "map-unknown-well.csv",
    ["M5,sample,INH-000010,10,,"],
    "well not on the plate",
    'map-unknown-well.csv line 10: "M5" is not a well of a 96-well plate',
  );
  badMap(
    "map-duplicate-well.csv",
    ["A2,sample,INH-000010,10,,", "A02,sample,INH-000011,10,,"],
    "plate map lists a well twice",
    "map-duplicate-well.csv line 11, well A2: well is listed twice (first on line 10)",
  );
  badMap(
    "map-unknown-role.csv",
    ["A2,positive,,,,"],
    "unknown role",
    'map-unknown-role.csv line 10, well A2: unknown role "positive"; use sample, neutral, full, blank, empty',
  );
  badMap(
    "map-sample-without-compound.csv",
    ["A2,sample,,10,,"],
    "sample without compound",
    "map-sample-without-compound.csv line 10, well A2: sample well has no compound",
  );
  badMap(
    "map-sample-without-concentration.csv",
    ["A2,sample,INH-000010,,,"],
    "sample without concentration",
    "map-sample-without-concentration.csv line 10, well A2: sample well has no concentration_uM",
  );
  badMap(
    "map-negative-concentration.csv",
    ["A2,sample,INH-000010,-3,,"],
    "negative concentration",
    "map-negative-concentration.csv line 10, well A2: concentration_uM -3 is negative",
  );
  badMap(
    "map-non-numeric-concentration.csv",
    ["A2,sample,INH-000010,lots,,"],
    "non-numeric concentration",
    'map-non-numeric-concentration.csv line 10, well A2: concentration_uM "lots" is not a number',
  );
  badMap(
    "map-formula-injection.csv",
    ["A2,sample,+INH-000010,10,,"],
    "text starting with +",
    'map-formula-injection.csv line 10: "+INH-000010" starts with "+", which a spreadsheet may run as a formula; text like this is refused',
  );
  add(
    "bad/map-too-few-controls.csv",
    "well,role,compound,concentration_uM,substrate_uM,group\nA1,neutral,,,,\nB1,neutral,,,,\nC1,neutral,,,,\nE1,full,,,,\nF1,full,,,,\nG1,full,,,,\nH1,full,,,,\nA2,sample,INH-000010,10,,\n",
  );
  bad.push({
    file: "bad/map-too-few-controls.csv",
    parseAs: "plate-map",
    format: 96,
    case: "three neutral controls",
    error: "map-too-few-controls.csv: plate map has 3 neutral control wells; at least 4 are needed",
  });

  const truth = {
    note: DEMO_NOTE,
    seed,
    units: {
      concentrations: "µM",
      times: "s",
      initialRatePerS: "signal units per second",
      enzyme: "vmaxUmPerS in µM/s, kmUm in µM",
    },
    good,
    bad,
    notCommitted: ["a file over 25 MB (the size limit) is generated in the tests instead"],
  };
  const truthJson = JSON.stringify(truth, null, 2) + "\n";
  add("truth.json", truthJson);
  const readme = fixtureReadme(good, bad);
  add("README.md", readme);
  return { files, good, bad, truthJson, readme };
}

function describeCompound(c: Record<string, unknown>): string {
  const parts: string[] = [String(c.id), String(c.kind === "mechanism" ? c.model : c.kind)];
  for (const k of ["kicUm", "kiuUm", "ic50Um", "hill", "residualActivity", "kiAppUm", "enzymeUm"])
    if (c[k] !== undefined) parts.push(`${k} ${String(c[k])}`);
  if (typeof c.ic50AtAssayUm === "number")
    parts.push(`IC50 at S = ${DEMO_SUBSTRATE_UM} µM: ${Number(c.ic50AtAssayUm.toPrecision(4))} µM`);
  return parts.join(", ");
}

function fixtureReadme(good: readonly GoodFixture[], bad: readonly BadFixture[]): string {
  const lines = [
    "# Plate fixtures — INVENTED data",
    "",
    "Every file here is simulated by `src/lib/plates/simulate.ts` from known parameters for a fictional",
    "enzyme target and fictional compounds (`INH-000001` …). None of it was measured on an instrument,",
    "and none of it may be used as a reference value. Regenerate with `npx tsx src/cli/fixtures.ts`",
    `(seed ${FIXTURE_SEED}); \`truth.json\` holds the same facts as this page in machine-readable form,`,
    "including every well's true % inhibition or initial rate.",
    "",
    `Fictional enzyme: Vmax ${DEMO_ENZYME.vmaxUmPerS} µM/s, Km ${DEMO_ENZYME.kmUm} µM; assay substrate ${DEMO_SUBSTRATE_UM} µM (= Km).`,
    "Kinetic signal = 200 + 500 · [product in µM] + noise (SD 3); the true initial rate in signal units per",
    "second is 500 · v(S0, I). Layout: neutral controls in the first and second-to-last column,",
    "full-inhibition controls in the second and last column.",
    "",
    "Research use only: results from real plates need review by a qualified scientist. Handle compounds",
    "and solvents according to their safety data sheets and local chemical-hygiene rules.",
    "",
    "## Good files",
    "",
  ];
  for (const g of good) {
    lines.push(
      `### ${g.file}`,
      "",
      `- plate map: \`${g.map}\``,
      `- shape ${g.shape}, ${g.format}-well, ${g.reads} read${g.reads === 1 ? "" : "s"}, ${g.wells} wells`,
      `- ${g.description}`,
    );
    const t = g.truth;
    const assay = t.assay as Record<string, unknown> | undefined;
    if (assay && "neutralSignal" in assay) {
      lines.push(
        `- signal: neutral ${String(assay.neutralSignal)}, full inhibition ${String(assay.fullSignal)}, noise SD ${String(assay.noiseSd)} + CV ${String(assay.noiseCvPct ?? 0)} %`,
      );
    }
    if (typeof t.expectedZPrime === "number")
      lines.push(`- expected Z′ from the true means and SDs: ${t.expectedZPrime.toFixed(3)}`);
    if (typeof t.expectedZPrimeWithoutEdge === "number")
      lines.push(
        `- expected Z′ without the edge effect: ${t.expectedZPrimeWithoutEdge.toFixed(3)}; edge loss ${String(t.edgeLossPct)} %`,
      );
    if (assay && "depletion" in assay && "vmaxUmPerS" in ((assay.enzyme as object | undefined) ?? {})) {
      const e = assay.enzyme as { vmaxUmPerS: number; kmUm: number };
      lines.push(
        `- enzyme: Vmax ${e.vmaxUmPerS} µM/s, Km ${e.kmUm} µM; substrate depletion ${assay.depletion ? "on" : "off"}`,
      );
    }
    for (const c of (t.compounds as Record<string, unknown>[] | undefined) ?? [])
      lines.push(`- ${describeCompound(c)}`);
    if (t.inhibitionPct) lines.push("- true % inhibition of each sample well: truth.json");
    if (t.initialRatePerS) lines.push("- true initial rate of each well: truth.json");
    lines.push("");
  }
  lines.push(
    "## Bad files (each must be refused with exactly this first message)",
    "",
    "| file | case | parse as | message |",
    "|---|---|---|---|",
  );
  for (const b of bad)
    lines.push(
      `| \`${b.file}\` | ${b.case} | ${b.parseAs}${b.format ? ` (${b.format}-well)` : ""} | \`${b.error.replace(/\|/g, "\\|")}\` |`,
    );
  lines.push("", "A file over 25 MB is not committed; the tests build one in memory.", "");
  return lines.join("\n");
}
