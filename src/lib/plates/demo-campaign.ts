/**
 * The demo campaign's plates: INVENTED data for a fictional target. A single-dose screen of
 * 384-well plates, dose-response plates for the hits and special compounds, and a kinetic
 * mechanism-study plate. The compound IDs (`INH-000001` …) are the registry IDs the demo seed
 * registers; compounds 1–6 have fixed, documented behaviour:
 *   INH-000001 competitive (Kic 0.8 µM) · INH-000002 uncompetitive (Kiu 1.5 µM)
 *   INH-000003 noncompetitive (Ki 2 µM) · INH-000004 mixed (Kic 1 µM, Kiu 4 µM, α 4)
 *   INH-000005 tight binder (K′ 1 nM at 10 nM enzyme, IC50 6 nM)
 *   INH-000006 partial inhibitor (IC50 2 µM, activity levels off at 35 %)
 * About 10 % of the rest are logistic inhibitors with IC50 between 0.05 and 50 µM (a higher hit
 * rate than a real screen, so the demo has hits to follow up).
 * By default the campaign uses 300 compounds, matching the chem module's invented demo library
 * (registered in order as INH-000001 … INH-000300); the screen spreads them evenly over the plates,
 * so most sample positions stay empty. Pass `compoundCount` to use a larger library.
 */
import { DEFAULT_REGISTRY_PREFIX, formatRegistryId } from "@/lib/registry-id";
import { writeGridText, writeLongEndpoint } from "./export-writers";
import type { PlateFormat } from "./geometry";
import {
  doseResponseCapacity,
  doseResponseLayout,
  mechanismLayout,
  singleDoseCapacity,
  singleDoseLayout,
} from "./layouts";
import { plateMapToCsv, type PlateMap } from "./plate-map";
import {
  type CompoundTruth,
  deriveSeed,
  type EndpointAssay,
  type EnzymeParameters,
  expectedZPrime,
  fractionalActivity,
  type KineticAssay,
  seededUniform,
  simulateEndpointPlate,
  simulateKineticPlate,
  trueIc50Um,
} from "./simulate";

export const DEMO_NOTE = "INVENTED demo data for a fictional target; not measured on any instrument.";

/** The fictional enzyme of the demo campaign. */
export const DEMO_ENZYME: EnzymeParameters = { vmaxUmPerS: 0.002, kmUm: 20 };
/** Assay substrate concentration for screens and dose-response (S = Km). */
export const DEMO_SUBSTRATE_UM = 20;

export function compoundId(n: number): string {
  return formatRegistryId(DEFAULT_REGISTRY_PREFIX, n);
}

export const SPECIAL_COMPOUNDS: readonly CompoundTruth[] = [
  { id: compoundId(1), kind: "mechanism", model: "competitive", kicUm: 0.8 },
  { id: compoundId(2), kind: "mechanism", model: "uncompetitive", kiuUm: 1.5 },
  { id: compoundId(3), kind: "mechanism", model: "noncompetitive", kicUm: 2 },
  { id: compoundId(4), kind: "mechanism", model: "mixed", kicUm: 1, kiuUm: 4 },
  { id: compoundId(5), kind: "tight-binding", kiAppUm: 0.001, enzymeUm: 0.01 },
  { id: compoundId(6), kind: "partial", ic50Um: 2, hill: 1, residualActivity: 0.35 },
];

/** Invented compounds INH-000001 … INH-<count>: the six specials, then mostly inactive ones. */
export function inventedCompounds(seed: number, count: number): CompoundTruth[] {
  const u = seededUniform(deriveSeed(seed, 1));
  const out: CompoundTruth[] = [...SPECIAL_COMPOUNDS.slice(0, count)];
  for (let n = out.length + 1; n <= count; n++) {
    const id = compoundId(n);
    if (u() < 0.1) {
      const ic50Um = Number((10 ** (Math.log10(0.05) + u() * (Math.log10(50) - Math.log10(0.05)))).toPrecision(3));
      const hill = Number((0.8 + u() * 0.7).toFixed(2));
      out.push({ id, kind: "logistic", ic50Um, hill });
    } else {
      u();
      u();
      out.push({ id, kind: "inactive" });
    }
  }
  return out;
}

export interface DemoPlate {
  readonly name: string;
  readonly experiment: "single-dose" | "dose-response" | "mechanism";
  readonly format: PlateFormat;
  readonly map: PlateMap;
  /** the plate map as CSV (well,role,compound,concentration_uM,substrate_uM,group) */
  readonly mapCsv: string;
  /** the reader export to upload */
  readonly file: { readonly name: string; readonly contents: string };
  readonly truth: Record<string, unknown>;
}

export interface DemoCampaign {
  readonly note: string;
  readonly seed: number;
  readonly enzyme: EnzymeParameters;
  readonly substrateUm: number;
  readonly compounds: readonly CompoundTruth[];
  readonly plates: readonly DemoPlate[];
}

export interface DemoOptions {
  /** compounds in the library, INH-000001 …; default 300 */
  readonly compoundCount?: number;
  /** single-dose plates (384-well); default 20 */
  readonly screenPlates?: number;
  /** compounds per screen plate, in duplicate; default: the library spread evenly (at most 160) */
  readonly compoundsPerPlate?: number;
  /** dose-response plates (384-well, 16 compounds each); default 3 */
  readonly doseResponsePlates?: number;
}

const SCREEN_ASSAY: EndpointAssay = {
  neutralSignal: 12000,
  fullSignal: 1500,
  noiseSd: 150,
  noiseCvPct: 4,
  substrateUm: DEMO_SUBSTRATE_UM,
  enzyme: DEMO_ENZYME,
  decimals: 0,
};

function truthOf(c: CompoundTruth): Record<string, unknown> {
  return { ...c, ic50AtAssayUm: trueIc50Um(c, DEMO_SUBSTRATE_UM, DEMO_ENZYME.kmUm) };
}

/**
 * Build the demo campaign deterministically from a seed: plate maps, export file contents and
 * the true parameters behind them. Screen plate 7 has a weak assay window (expected to fail QC)
 * and plate 13 an edge effect, so the QC screens have something to show.
 */
export function demoCampaignPlates(seed: number, options: DemoOptions = {}): DemoCampaign {
  const screenPlates = options.screenPlates ?? 20;
  const count = Math.max(options.compoundCount ?? 300, SPECIAL_COMPOUNDS.length);
  const perPlate = Math.min(options.compoundsPerPlate ?? Math.ceil(count / screenPlates), singleDoseCapacity(384, 2));
  const drPlates = options.doseResponsePlates ?? 3;
  const compounds = inventedCompounds(seed, count);
  const byId = new Map(compounds.map((c) => [c.id, c]));
  const plates: DemoPlate[] = [];

  for (let p = 0; p < screenPlates; p++) {
    const ids = compounds.slice(p * perPlate, (p + 1) * perPlate).map((c) => c.id);
    if (ids.length === 0) break;
    const name = `screen-${String(p + 1).padStart(2, "0")}`;
    const map = singleDoseLayout(384, ids, 10, 2, { referenceCompound: compoundId(1), referenceConcentrationUm: 100 });
    const assay: EndpointAssay =
      p === 6
        ? { ...SCREEN_ASSAY, noiseSd: 900, noiseCvPct: 8 }
        : p === 12
          ? { ...SCREEN_ASSAY, edgeLossPct: 25 }
          : SCREEN_ASSAY;
    const values = simulateEndpointPlate(map, byId, assay, deriveSeed(seed, 100 + p));
    plates.push({
      name,
      experiment: "single-dose",
      format: 384,
      map,
      mapCsv: plateMapToCsv(map),
      file: {
        name: `${name}.csv`,
        contents: writeGridText(384, [{ values }], { notes: [`Invented demo plate ${name}`, ""] }),
      },
      truth: {
        note: DEMO_NOTE,
        assay,
        expectedZPrime: expectedZPrime(assay),
        ...(p === 6
          ? { expectedQc: "fail (weak window)" }
          : p === 12
            ? { expectedQc: "edge effect: outer ring 25 % low" }
            : {}),
        inhibitionPctAt10uM: Object.fromEntries(
          ids.map((id) => [id, 100 * (1 - fractionalActivity(byId.get(id)!, 10, DEMO_SUBSTRATE_UM, DEMO_ENZYME))]),
        ),
      },
    });
  }

  // Dose-response: the six specials, then the most potent screen actives.
  const cap = doseResponseCapacity(384, 10, 2);
  const actives = compounds
    .slice(SPECIAL_COMPOUNDS.length)
    .filter((c) => c.kind === "logistic")
    .sort((a, b) => (trueIc50Um(a) ?? Infinity) - (trueIc50Um(b) ?? Infinity));
  const drCompounds = [...compounds.slice(0, SPECIAL_COMPOUNDS.length), ...actives].slice(0, drPlates * cap);
  for (let p = 0; p * cap < drCompounds.length && p < drPlates; p++) {
    const chunk = drCompounds.slice(p * cap, (p + 1) * cap);
    const name = `dose-response-${String(p + 1).padStart(2, "0")}`;
    const series = chunk.map((c) => ({ compound: c.id, topConcentrationUm: c.kind === "tight-binding" ? 1 : 100 }));
    const map = doseResponseLayout(
      384,
      series,
      { points: 10, dilutionFactor: 3, replicates: 2 },
      { referenceCompound: compoundId(1), referenceConcentrationUm: 100 },
    );
    const values = simulateEndpointPlate(map, byId, SCREEN_ASSAY, deriveSeed(seed, 200 + p));
    plates.push({
      name,
      experiment: "dose-response",
      format: 384,
      map,
      mapCsv: plateMapToCsv(map),
      file: { name: `${name}.csv`, contents: writeLongEndpoint(values, { notes: [`Invented demo plate ${name}`] }) },
      truth: {
        note: DEMO_NOTE,
        assay: SCREEN_ASSAY,
        expectedZPrime: expectedZPrime(SCREEN_ASSAY),
        compounds: chunk.map(truthOf),
      },
    });
  }

  // Mechanism study: the four mechanism compounds on one kinetic plate.
  const mech = mechanismStudy(seed, byId);
  plates.push(mech);
  return { note: DEMO_NOTE, seed, enzyme: DEMO_ENZYME, substrateUm: DEMO_SUBSTRATE_UM, compounds, plates };
}

export const MECHANISM_SUBSTRATE_UM = [2.5, 5, 10, 15, 20, 30, 40, 60, 100, 200] as const;

/** Inhibitor series for a mechanism block: 0 and 0.5, 1 and 3 times a representative Ki. */
export function inhibitorSeries(c: CompoundTruth): number[] {
  const k = c.kind === "mechanism" ? (c.kicUm ?? c.kiuUm ?? 1) : 1;
  return [0, 0.5 * k, k, 3 * k].map((x) => Number(x.toPrecision(6)));
}

export const MECHANISM_ASSAY: KineticAssay = {
  enzyme: DEMO_ENZYME,
  defaultSubstrateUm: DEMO_SUBSTRATE_UM,
  timesS: Array.from({ length: 60 }, (_, k) => k * 10),
  gainPerUm: 500,
  baseline: 200,
  noiseSd: 3,
  depletion: true,
  decimals: 1,
};

function mechanismStudy(seed: number, byId: ReadonlyMap<string, CompoundTruth>): DemoPlate {
  const specials = SPECIAL_COMPOUNDS.slice(0, 4);
  const map = mechanismLayout(
    384,
    specials.map((c) => ({ compound: c.id, inhibitorUm: inhibitorSeries(c) })),
    MECHANISM_SUBSTRATE_UM,
    2,
    { substrateUm: DEMO_SUBSTRATE_UM },
  );
  const sim = simulateKineticPlate(map, byId, MECHANISM_ASSAY, deriveSeed(seed, 300));
  const name = "mechanism-01";
  const reads = MECHANISM_ASSAY.timesS.map((timeS, k) => ({
    timeS,
    values: new Map([...sim.wells].map(([w, s]) => [w, s[k]!])),
  }));
  return {
    name,
    experiment: "mechanism",
    format: 384,
    map,
    mapCsv: plateMapToCsv(map),
    file: { name: `${name}.csv`, contents: writeGridText(384, reads, { notes: [`Invented demo plate ${name}`] }) },
    truth: {
      note: DEMO_NOTE,
      assay: MECHANISM_ASSAY,
      enzyme: DEMO_ENZYME,
      compounds: specials.map(truthOf),
      initialRatePerS: Object.fromEntries([...sim.truth].map(([w, t]) => [w, t.initialRatePerS])),
    },
  };
}
