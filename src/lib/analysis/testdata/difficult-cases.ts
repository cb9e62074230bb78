/**
 * INVENTED difficult data for the pipeline's tests: dose-response series and substrate ×
 * inhibitor matrices of the kinds that make a careless fit confidently wrong — partial
 * inhibition, substrate inhibition, tight binding with [E] near Ki, proportional noise, one wild
 * well, an inactive compound, a weak one and an activator — each from known parameters. Not
 * measured on any instrument and not a reference by itself: the tests check that the known
 * parameters and the right model or label come back.
 *
 * Rate laws (science.md, "Is the model adequate?"; Segel 1975, Cornish-Bowden, Copeland 2005
 * [from memory]); the standard models and the Morrison quadratic come from the plate simulator
 * (src/lib/plates/simulate.ts):
 *   substrate inhibition, competitive inhibitor: v = V·S / (Km(1 + I/Ki) + S + S²/Ksi)
 *   partial mixed:   v = V·S·(1 + β·I/(α·Ki)) / (Km(1 + I/Ki) + S(1 + I/(α·Ki)))
 *   tight binding, competitive: v = V·S/(Km + S) · M(E, I, K′), K′ = Ki(1 + S/Km)
 * Concentrations µM; rates in signal units per second.
 */
import { morrisonActivity, seededNormal, steadyStateRate, type EnzymeParameters } from "@/lib/plates/simulate";

/** The fictional enzyme (as the demo campaign's): Km 20 µM; V in signal units per second. */
export const ENZYME: EnzymeParameters = { vmaxUmPerS: 100, kmUm: 20 };
/** Substrate series of a mechanism study, 0.125–10 × Km (as the demo's). */
export const SUBSTRATES_UM = [2.5, 5, 10, 15, 20, 30, 40, 60, 100, 200] as const;
/** Total enzyme in the assay, µM (10 nM): the campaign's [E]. */
export const ENZYME_UM = 0.01;

export interface MechanismCase {
  id: string;
  what: string;
  inhibitorUm: number[];
  rate: (sUm: number, iUm: number) => number;
  /** Absolute noise SD of a rate, and proportional noise (CV, fraction) on top. */
  noiseSd: number;
  noiseCv: number;
}

const V = ENZYME.vmaxUmPerS;
const KM = ENZYME.kmUm;

export const MECHANISM_CASES: readonly MechanismCase[] = [
  {
    id: "substrate-inhibited",
    what: "a competitive inhibitor (Ki 1 µM) of an enzyme inhibited by its substrate (Ksi 60 µM)",
    inhibitorUm: [0, 0.5, 1, 3],
    rate: (s, i) => (V * s) / (KM * (1 + i / 1) + s + (s * s) / 60),
    noiseSd: 0.5,
    noiseCv: 0,
  },
  {
    id: "partial",
    what: "a partial noncompetitive inhibitor (Ki 1 µM, α 1, β 0.3: 30 % of the activity stays)",
    inhibitorUm: [0, 0.3, 1, 3, 10],
    rate: (s, i) => (V * s * (1 + (0.3 * i) / 1)) / (KM * (1 + i / 1) + s * (1 + i / 1)),
    noiseSd: 0.5,
    noiseCv: 0,
  },
  {
    id: "tight-binder",
    what: "a competitive tight binder (Ki 5 nM) at 10 nM enzyme",
    inhibitorUm: [0, 0.005, 0.01, 0.03, 0.1],
    rate: (s, i) => steadyStateRate(ENZYME, s, 0) * morrisonActivity(ENZYME_UM, i, 0.005 * (1 + s / KM)),
    noiseSd: 0.5,
    noiseCv: 0,
  },
  {
    id: "proportional-noise",
    what: "a competitive inhibitor (Ki 1 µM) whose rates scatter in proportion (CV 10 %)",
    inhibitorUm: [0, 0.5, 1, 3],
    rate: (s, i) => steadyStateRate(ENZYME, s, i, 1),
    noiseSd: 0.05,
    noiseCv: 0.1,
  },
  {
    id: "mixed-clean",
    what: "a mixed inhibitor (Kic 1 µM, Kiu 4 µM) with ordinary noise: no alarm expected",
    inhibitorUm: [0, 0.5, 1, 3],
    rate: (s, i) => steadyStateRate(ENZYME, s, i, 1, 4),
    noiseSd: 0.5,
    noiseCv: 0,
  },
];

/** Duplicate rates of a case at every (S, I), in matrix order, with seeded noise. */
export function mechanismRates(c: MechanismCase, seed: number, replicates = 2) {
  const z = seededNormal(seed);
  const out: { substrateUm: number; inhibitorUm: number; rate: number }[] = [];
  for (const i of c.inhibitorUm)
    for (const s of SUBSTRATES_UM)
      for (let r = 0; r < replicates; r++) {
        const v = c.rate(s, i);
        const sd = Math.sqrt(c.noiseSd ** 2 + (c.noiseCv * v) ** 2);
        out.push({ substrateUm: s, inhibitorUm: i, rate: v + sd * z() });
      }
  return out;
}

export interface DoseCase {
  id: string;
  what: string;
  topUm: number;
  /** True % inhibition at concentration x µM. */
  inhibitionPct: (xUm: number) => number;
  /** Replace the response of one well: [concentration index from the top, replicate, % inhibition]. */
  wild?: [number, number, number];
}

const logistic = (x: number, ic50: number, hill: number, top = 100, bottom = 0) =>
  bottom + (top - bottom) / (1 + (ic50 / x) ** hill);

export const DOSE_CASES: readonly DoseCase[] = [
  {
    id: "clean",
    what: "an ordinary inhibitor (IC50 0.5 µM, Hill 1)",
    topUm: 100,
    inhibitionPct: (x) => logistic(x, 0.5, 1),
  },
  {
    id: "partial",
    what: "a partial inhibitor (IC50 2 µM; inhibition levels off at 65 %)",
    topUm: 100,
    inhibitionPct: (x) => logistic(x, 2, 1, 65),
  },
  { id: "inactive", what: "an inactive compound", topUm: 100, inhibitionPct: () => 0 },
  {
    id: "weak",
    what: "a weak inhibitor (IC50 250 µM: 29 % inhibition at the top concentration, 100 µM)",
    topUm: 100,
    inhibitionPct: (x) => logistic(x, 250, 1),
  },
  {
    id: "activator",
    what: "an activator (activity up to 1.6 × the vehicle, EC50 3 µM)",
    topUm: 100,
    inhibitionPct: (x) => -60 * (x / (x + 3)),
  },
  {
    id: "wild-well",
    what: "an ordinary inhibitor (IC50 1 µM) with one wild well: a top-concentration well that reads like the vehicle",
    topUm: 100,
    inhibitionPct: (x) => logistic(x, 1, 1),
    wild: [0, 1, 0],
  },
  {
    id: "tight-binder",
    what: "a tight binder (K′ 1 nM at 10 nM enzyme: IC50 6 nM)",
    topUm: 1,
    inhibitionPct: (x) => 100 * (1 - morrisonActivity(ENZYME_UM, x, 0.001)),
  },
];

/** Ten 3-fold dilutions from the top, in duplicate, % inhibition with seeded noise (SD 3 %). */
export function doseSeries(c: DoseCase, seed: number, noiseSdPct = 3) {
  const z = seededNormal(seed);
  const out: { concentrationUm: number; replicate: number; inhibitionPct: number }[] = [];
  for (let k = 0; k < 10; k++) {
    const x = Number((c.topUm / 3 ** k).toPrecision(6));
    for (let r = 0; r < 2; r++) {
      const wild = c.wild && c.wild[0] === k && c.wild[1] === r;
      out.push({
        concentrationUm: x,
        replicate: r,
        inhibitionPct: wild ? c.wild![2] : c.inhibitionPct(x) + noiseSdPct * z(),
      });
    }
  }
  return out;
}
