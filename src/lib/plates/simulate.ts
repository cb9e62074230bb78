/**
 * Simulated plate reads from known parameters, for fixtures, tests and the demo campaign.
 * Everything produced here is INVENTED data. Pure and deterministic: the same seed gives the same
 * numbers on every machine (mulberry32 generator, Box–Muller normals).
 *
 * Signal model (common practice for activity assays): a well's signal is
 *   endpoint: full + (neutral − full) · activity
 *   kinetic:  baseline + gain · [P](t), with d[P]/dt = v([S](t), I) and, when depletion is on,
 *             d[S]/dt = −v (integrated with classical 4th-order Runge–Kutta); without depletion
 *             [P] = v(S0, I)·t exactly.
 * plus Gaussian noise (absolute SD and/or a CV proportional to the signal).
 */
import { isEdgeWell, parseWellName } from "./geometry";
import type { PlateMap, PlateMapWell } from "./plate-map";
import { seededUniform } from "../random";

// ---------------------------------------------------------------- random numbers

export { seededUniform };

/** Standard normal draws by the Box–Muller transform (Box & Muller, Ann Math Stat 1958 [mem]). */
export function seededNormal(seed: number): () => number {
  const u = seededUniform(seed);
  let spare: number | undefined;
  return () => {
    if (spare !== undefined) {
      const s = spare;
      spare = undefined;
      return s;
    }
    let u1 = u();
    while (u1 <= Number.MIN_VALUE) u1 = u();
    const r = Math.sqrt(-2 * Math.log(u1));
    const theta = 2 * Math.PI * u();
    spare = r * Math.sin(theta);
    return r * Math.cos(theta);
  };
}

/** Derive an independent seed for a sub-stream (e.g. plate 7 of a campaign). */
export function deriveSeed(seed: number, ...parts: number[]): number {
  let h = (seed ^ 0x9e3779b9) >>> 0;
  for (const p of parts) {
    h = Math.imul(h ^ (p >>> 0), 0x85ebca6b) >>> 0;
    h = (h ^ (h >>> 13)) >>> 0;
    h = Math.imul(h, 0xc2b2ae35) >>> 0;
    h = (h ^ (h >>> 16)) >>> 0;
  }
  return h;
}

// ---------------------------------------------------------------- models

export type MechanismModel = "competitive" | "uncompetitive" | "noncompetitive" | "mixed";

export interface EnzymeParameters {
  /** Vmax in µM product per second at the assay's enzyme concentration */
  readonly vmaxUmPerS: number;
  readonly kmUm: number;
}

/**
 * Steady-state rate for the mixed model v = Vmax·S / (Km(1+I/Kic) + S(1+I/Kiu)); competitive has
 * 1/Kiu = 0, uncompetitive 1/Kic = 0, noncompetitive Kic = Kiu (Segel 1975; Cornish-Bowden
 * [mem]). Pass Infinity (or omit) for an absent constant.
 */
export function steadyStateRate(
  enzyme: EnzymeParameters,
  sUm: number,
  iUm: number,
  kicUm = Infinity,
  kiuUm = Infinity,
): number {
  const a = Number.isFinite(kicUm) ? iUm / kicUm : 0;
  const b = Number.isFinite(kiuUm) ? iUm / kiuUm : 0;
  return (enzyme.vmaxUmPerS * sUm) / (enzyme.kmUm * (1 + a) + sUm * (1 + b));
}

/**
 * Morrison quadratic for tight binding: v/v0 = 1 − ((E+I+K′) − √((E+I+K′)² − 4EI)) / (2E), with
 * total enzyme E, total inhibitor I and apparent constant K′ in the same units (Morrison, Biochim
 * Biophys Acta 1969;185:269 [mem]). IC50 = K′ + E/2 (Copeland et al. 1995).
 */
export function morrisonActivity(enzymeUm: number, iUm: number, kiAppUm: number): number {
  const b = enzymeUm + iUm + kiAppUm;
  // Written as 2EI/(b+√…) to avoid cancellation when I ≪ E or E ≪ K′.
  const disc = Math.max(0, b * b - 4 * enzymeUm * iUm);
  const bound = (2 * enzymeUm * iUm) / (b + Math.sqrt(disc));
  return 1 - bound / enzymeUm;
}

/**
 * Four-parameter logistic y = Bottom + (Top − Bottom)/(1 + 10^(h·(log10 x − log10 IC50))) — the
 * form, the same model as R's SSfpl on ln x.
 */
export function fourParameterLogistic(
  x: number,
  p: { top: number; bottom: number; ic50: number; hill: number },
): number {
  if (x <= 0) return p.hill > 0 ? p.top : p.bottom;
  return p.bottom + (p.top - p.bottom) / (1 + 10 ** (p.hill * (Math.log10(x) - Math.log10(p.ic50))));
}

/** What a simulated compound does. All concentrations in µM. */
export type CompoundTruth =
  | { readonly id: string; readonly kind: "inactive" }
  /** logistic dose-response from 100 % to 0 % activity */
  | { readonly id: string; readonly kind: "logistic"; readonly ic50Um: number; readonly hill: number }
  /** partial inhibitor: activity levels off at residualActivity (0–1) instead of 0 */
  | {
      readonly id: string;
      readonly kind: "partial";
      readonly ic50Um: number;
      readonly hill: number;
      readonly residualActivity: number;
    }
  /** tight binder (Morrison) at total enzyme enzymeUm; IC50 = kiAppUm + enzymeUm/2 */
  | { readonly id: string; readonly kind: "tight-binding"; readonly kiAppUm: number; readonly enzymeUm: number }
  /** steady-state mechanism; activity at substrate S follows the rate law */
  | {
      readonly id: string;
      readonly kind: "mechanism";
      readonly model: MechanismModel;
      readonly kicUm?: number;
      readonly kiuUm?: number;
    };

/** Kic and Kiu of a mechanism compound, with Infinity for the absent one. */
export function mechanismConstants(c: Extract<CompoundTruth, { kind: "mechanism" }>): { kic: number; kiu: number } {
  switch (c.model) {
    case "competitive":
      return { kic: c.kicUm!, kiu: Infinity };
    case "uncompetitive":
      return { kic: Infinity, kiu: c.kiuUm! };
    case "noncompetitive":
      return { kic: c.kicUm!, kiu: c.kicUm! };
    case "mixed":
      return { kic: c.kicUm!, kiu: c.kiuUm! };
  }
}

/**
 * Fraction of uninhibited activity (v/v0, 0–1) of a compound at inhibitor concentration I and,
 * for mechanism compounds, substrate S with the enzyme's Km.
 */
export function fractionalActivity(
  c: CompoundTruth,
  iUm: number,
  sUm = 1,
  enzyme: EnzymeParameters = { vmaxUmPerS: 1, kmUm: 1 },
): number {
  if (iUm <= 0) return 1;
  switch (c.kind) {
    case "inactive":
      return 1;
    case "logistic":
      return fourParameterLogistic(iUm, { top: 1, bottom: 0, ic50: c.ic50Um, hill: c.hill });
    case "partial":
      return fourParameterLogistic(iUm, { top: 1, bottom: c.residualActivity, ic50: c.ic50Um, hill: c.hill });
    case "tight-binding":
      return morrisonActivity(c.enzymeUm, iUm, c.kiAppUm);
    case "mechanism": {
      const { kic, kiu } = mechanismConstants(c);
      return steadyStateRate(enzyme, sUm, iUm, kic, kiu) / steadyStateRate(enzyme, sUm, 0);
    }
  }
}

/**
 * True IC50 of a compound at substrate S: Cheng–Prusoff's general form
 * IC50 = (S + Km)/(S/Kiu + Km/Kic) for mechanism compounds (Cheng & Prusoff 1973), K′ + E/2 for a
 * tight binder (Copeland et al. 1995), the logistic midpoint otherwise (for a partial inhibitor,
 * the inflection point, not the 50 % crossing).
 */
export function trueIc50Um(c: CompoundTruth, sUm = 1, kmUm = 1): number | undefined {
  switch (c.kind) {
    case "inactive":
      return undefined;
    case "logistic":
    case "partial":
      return c.ic50Um;
    case "tight-binding":
      return c.kiAppUm + c.enzymeUm / 2;
    case "mechanism": {
      const { kic, kiu } = mechanismConstants(c);
      return (sUm + kmUm) / (sUm / kiu + kmUm / kic);
    }
  }
}

// ---------------------------------------------------------------- progress curves

export interface ProgressCurveOptions {
  readonly enzyme: EnzymeParameters;
  readonly s0Um: number;
  readonly iUm: number;
  readonly kicUm?: number;
  readonly kiuUm?: number;
  /** extra factor on the rate (e.g. a logistic or Morrison activity) */
  readonly activity?: number;
  readonly timesS: readonly number[];
  /** follow substrate consumption; off gives an exactly linear curve */
  readonly depletion: boolean;
}

/** Product concentration (µM) at each time. */
export function productCurve(o: ProgressCurveOptions): number[] {
  const act = o.activity ?? 1;
  const rate = (s: number) => act * steadyStateRate(o.enzyme, Math.max(0, s), o.iUm, o.kicUm, o.kiuUm);
  if (!o.depletion) {
    const v0 = rate(o.s0Um);
    return o.timesS.map((t) => v0 * t);
  }
  const out: number[] = [];
  let s = o.s0Um;
  let t = 0;
  // Step size: small against the time scale of consumption and the read interval.
  const v0 = rate(o.s0Um);
  const scale = v0 > 0 ? o.s0Um / v0 : Infinity;
  for (const target of o.timesS) {
    while (t < target - 1e-12) {
      const h = Math.min(target - t, Math.max(1e-3, Math.min(1, scale / 200)));
      const k1 = -rate(s);
      const k2 = -rate(s + (h / 2) * k1);
      const k3 = -rate(s + (h / 2) * k2);
      const k4 = -rate(s + h * k3);
      s += (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
      t += h;
    }
    out.push(o.s0Um - s);
  }
  return out;
}

// ---------------------------------------------------------------- plates

export interface EndpointAssay {
  /** mean signal of neutral (0 % inhibition) wells */
  readonly neutralSignal: number;
  /** mean signal of full-inhibition wells (and blanks) */
  readonly fullSignal: number;
  /** absolute noise SD per well, signal units */
  readonly noiseSd: number;
  /** proportional noise, % of the expected signal */
  readonly noiseCvPct?: number;
  /** signal loss in the outer ring, % (an edge effect to test QC) */
  readonly edgeLossPct?: number;
  /** the assay's substrate concentration, for mechanism compounds */
  readonly substrateUm?: number;
  readonly enzyme?: EnzymeParameters;
  /** digits after the decimal point in the export */
  readonly decimals: number;
}

function noisy(expected: number, sd: number, cvPct: number | undefined, z: () => number): number {
  const total = Math.sqrt(sd * sd + ((cvPct ?? 0) / 100) ** 2 * expected * expected);
  return expected + total * z();
}

function roundTo(x: number, decimals: number): number {
  return Number(x.toFixed(decimals));
}

function activityOf(
  w: PlateMapWell,
  compounds: ReadonlyMap<string, CompoundTruth>,
  sUm: number,
  enzyme: EnzymeParameters,
): number {
  if (w.role !== "sample") return 1;
  const c = w.compound ? compounds.get(w.compound) : undefined;
  if (!c) return 1;
  return fractionalActivity(c, w.concentrationUm ?? 0, w.substrateUm ?? sUm, enzyme);
}

/**
 * One endpoint read of a plate: every well gets a value (empty wells read as background, as a
 * reader reads the whole plate). Returns canonical well → value, in plate order.
 */
export function simulateEndpointPlate(
  map: PlateMap,
  compounds: ReadonlyMap<string, CompoundTruth>,
  assay: EndpointAssay,
  seed: number,
): Map<string, number> {
  const z = seededNormal(seed);
  const enzyme = assay.enzyme ?? { vmaxUmPerS: 1, kmUm: 1 };
  const out = new Map<string, number>();
  for (const w of map.wells) {
    let expected: number;
    if (w.role === "full" || w.role === "blank" || w.role === "empty") expected = assay.fullSignal;
    else
      expected =
        assay.fullSignal +
        (assay.neutralSignal - assay.fullSignal) * activityOf(w, compounds, assay.substrateUm ?? 1, enzyme);
    const pos = parseWellName(w.well)!;
    if (assay.edgeLossPct && isEdgeWell(pos, map.format)) expected *= 1 - assay.edgeLossPct / 100;
    out.set(w.well, roundTo(noisy(expected, assay.noiseSd, assay.noiseCvPct, z), assay.decimals));
  }
  return out;
}

export interface KineticAssay {
  readonly enzyme: EnzymeParameters;
  /** substrate for wells without substrate_uM (e.g. controls) */
  readonly defaultSubstrateUm: number;
  readonly timesS: readonly number[];
  /** signal units per µM product */
  readonly gainPerUm: number;
  readonly baseline: number;
  readonly noiseSd: number;
  readonly depletion: boolean;
  readonly decimals: number;
}

export interface KineticWellTruth {
  readonly sUm: number;
  readonly iUm: number;
  /** true initial rate, signal units per second (gain · v(S0, I)) */
  readonly initialRatePerS: number;
}

/**
 * Progress curves for a kinetic plate: neutral wells run uninhibited, full-inhibition wells and
 * blanks have no enzyme (flat), sample wells follow their compound. Empty wells are not written.
 */
export function simulateKineticPlate(
  map: PlateMap,
  compounds: ReadonlyMap<string, CompoundTruth>,
  assay: KineticAssay,
  seed: number,
): { wells: Map<string, number[]>; truth: Map<string, KineticWellTruth> } {
  const z = seededNormal(seed);
  const wells = new Map<string, number[]>();
  const truth = new Map<string, KineticWellTruth>();
  for (const w of map.wells) {
    if (w.role === "empty") continue;
    const sUm = w.substrateUm ?? assay.defaultSubstrateUm;
    const iUm = w.role === "sample" ? (w.concentrationUm ?? 0) : 0;
    let product: number[];
    let v0 = 0;
    if (w.role === "full" || w.role === "blank") {
      product = assay.timesS.map(() => 0);
    } else {
      const c = w.role === "sample" && w.compound ? compounds.get(w.compound) : undefined;
      let kic = Infinity;
      let kiu = Infinity;
      let activity = 1;
      if (c?.kind === "mechanism") ({ kic, kiu } = mechanismConstants(c));
      else if (c) activity = fractionalActivity(c, iUm);
      product = productCurve({
        enzyme: assay.enzyme,
        s0Um: sUm,
        iUm,
        kicUm: kic,
        kiuUm: kiu,
        activity,
        timesS: assay.timesS,
        depletion: assay.depletion,
      });
      v0 = activity * steadyStateRate(assay.enzyme, sUm, iUm, kic, kiu);
    }
    wells.set(
      w.well,
      product.map((p) => roundTo(assay.baseline + assay.gainPerUm * p + assay.noiseSd * z(), assay.decimals)),
    );
    truth.set(w.well, { sUm, iUm, initialRatePerS: assay.gainPerUm * v0 });
  }
  return { wells, truth };
}

/** Expected Z′ from the true control means and SDs: 1 − 3(σ₊ + σ₋)/|μ₊ − μ₋| (Zhang et al. 1999). */
export function expectedZPrime(assay: EndpointAssay): number {
  const sd = (mu: number) => Math.sqrt(assay.noiseSd ** 2 + ((assay.noiseCvPct ?? 0) / 100) ** 2 * mu * mu);
  return 1 - (3 * (sd(assay.neutralSignal) + sd(assay.fullSignal))) / Math.abs(assay.neutralSignal - assay.fullSignal);
}
