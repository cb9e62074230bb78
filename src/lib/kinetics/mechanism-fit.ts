/**
 * Mechanism of action from a substrate × inhibitor matrix of initial rates: global least-squares
 * fits of the competitive, uncompetitive, noncompetitive and mixed models (inhibition-models.ts),
 * then a model choice.
 *
 * Parameterisation v = V·S/(Km(1 + a·I) + S(1 + b·I)), a = 1/Kic ≥ 0, b = 1/Kiu ≥ 0, so that the
 * mixed model reaches its competitive (b = 0) and uncompetitive (a = 0) boundaries with finite
 * parameters. Standard errors from Cov = inverse(JᵀJ)·RSS/(n − p) (Bates & Watts 1988); Kic, Kiu
 * by the delta method and CIs by inverting the CI of a, b (null = unbounded).
 *
 * Choice (Burnham & Anderson 2002; Motulsky & Christopoulos 2004 [from memory]):
 * 1. AICc for each model (K = fitted parameters + 1), Akaike weights.
 * 2. If a three-parameter model has the lowest AICc, it is chosen.
 * 3. If mixed has the lowest AICc, it is chosen only when the extra-sum-of-squares F-test favours
 *    it at p < 0.05 against every nested three-parameter model — that is, against the best of
 *    them (the one with the lowest RSS has the largest p). Otherwise that best simpler model is
 *    kept. The F-test at the a = 0 or b = 0 boundary is approximate (nesting on a boundary).
 * 4. Label "ambiguous" when any other model's AICc is less than 2 above the chosen one's (or
 *    below it), else "clear".
 * Ties (equal AICc, as when the data show no inhibition) resolve in the order competitive,
 * uncompetitive, noncompetitive, mixed.
 *
 * For exact (noise-free) data, RSS values below 1e-16 of Σ(w·y)² are treated as that floor when
 * computing AICc and F, so rounding noise cannot decide the model.
 *
 * Rows with substrate 0 are accepted: every model predicts v = 0 there, so they do not move the
 * parameters but do count in n and RSS (unweighted). With relative weighting (residual / observed
 * rate) they are left out, since their weight would be infinite.
 */
import { levenbergMarquardt, parameterCovariance, type LeastSquaresProblem } from "./least-squares";
import { michaelisMentenStart } from "./michaelis-menten";
import { aicc, akaikeWeights, extraSumOfSquaresFTest, type FTestResult } from "./model-selection";
import { INHIBITION_MODELS, MODEL_PARAMETER_COUNT, type InhibitionModel } from "./inhibition-models";
import { type Interval, finiteOrNull, reciprocalConstant, waldInterval95 } from "./parameter-summary";

export interface MechanismPoint {
  substrate: number;
  inhibitor: number;
  rate: number;
}

export interface MechanismOptions {
  /** "none" (default): ordinary least squares. "relative": residuals divided by the observed rate. */
  weighting?: "none" | "relative";
}

export interface MechanismModelFit {
  model: InhibitionModel;
  nParams: number;
  vmax: number;
  km: number;
  /** Kic (binding to free enzyme); null where the model has none or a = 0 (infinite). */
  kic: number | null;
  /** Kiu (binding to the enzyme–substrate complex); null where the model has none or b = 0. */
  kiu: number | null;
  /** α = Kiu/Kic: null for competitive (infinite), 0 for uncompetitive, 1 for noncompetitive. */
  alpha: number | null;
  /** Fitted reciprocal constants a = 1/Kic and b = 1/Kiu (0 where absent). */
  a: number;
  b: number;
  se: {
    vmax: number | null;
    km: number | null;
    kic: number | null;
    kiu: number | null;
    a: number | null;
    b: number | null;
  };
  ci95: { vmax: Interval; km: Interval; kic: Interval; kiu: Interval };
  rss: number;
  aicc: number;
  deltaAicc: number;
  akaikeWeight: number;
  /** Extra-sum-of-squares F-test of this model against mixed (null for mixed itself). */
  fTestVsMixed: FTestResult | null;
  dof: number;
  converged: boolean;
}

export interface MechanismResult {
  best: InhibitionModel;
  label: "clear" | "ambiguous";
  models: Record<InhibitionModel, MechanismModelFit>;
  /** Rows used in the fit. */
  n: number;
  weighting: "none" | "relative";
}

interface Data {
  s: Float64Array;
  i: Float64Array;
  y: Float64Array;
  w: Float64Array;
  n: number;
}

/** Maps a model's free parameter vector to (V, Km, a, b). */
function unpack(model: InhibitionModel, t: ArrayLike<number>): [number, number, number, number] {
  switch (model) {
    case "competitive":
      return [t[0]!, t[1]!, t[2]!, 0];
    case "uncompetitive":
      return [t[0]!, t[1]!, 0, t[2]!];
    case "noncompetitive":
      return [t[0]!, t[1]!, t[2]!, t[2]!];
    case "mixed":
      return [t[0]!, t[1]!, t[2]!, t[3]!];
  }
}

function makeProblem(model: InhibitionModel, d: Data): LeastSquaresProblem {
  const p = MODEL_PARAMETER_COUNT[model];
  const lower = model === "mixed" ? [-Infinity, 0, 0, 0] : [-Infinity, 0, 0];
  const { s, i: inh, y, w, n } = d;
  return {
    nParams: p,
    nObs: n,
    lower,
    evaluate(theta, r, jac) {
      // Direct reads (no array from unpack): this runs for every iteration of every fit.
      const vmax = theta[0]!;
      const km = theta[1]!;
      const a = model === "uncompetitive" ? 0 : theta[2]!;
      const b = model === "competitive" ? 0 : model === "mixed" ? theta[3]! : theta[2]!;
      for (let k = 0; k < n; k++) {
        const sk = s[k]!;
        const ik = inh[k]!;
        const wk = w[k]!;
        const ka = 1 + a * ik;
        const den = km * ka + sk * (1 + b * ik);
        const g = den !== 0 ? sk / den : 0; // S = 0 rows: v = 0 whatever the parameters
        r[k] = wk * (y[k]! - vmax * g);
        if (jac) {
          const row = k * p;
          const q = den !== 0 ? (wk * vmax * g) / den : 0; // w·V·S/den²
          jac[row] = wk * g;
          jac[row + 1] = -q * ka;
          const da = -q * km * ik;
          const db = -q * sk * ik;
          if (model === "competitive") jac[row + 2] = da;
          else if (model === "uncompetitive") jac[row + 2] = db;
          else if (model === "noncompetitive") jac[row + 2] = da + db;
          else {
            jac[row + 2] = da;
            jac[row + 3] = db;
          }
        }
      }
    },
  };
}

/** RSS of (V, Km, a, b) with V projected out (the model is linear in V). */
function projectedRss(d: Data, km: number, a: number, b: number): { rss: number; vmax: number } {
  let sgg = 0;
  let sgy = 0;
  let syy = 0;
  for (let k = 0; k < d.n; k++) {
    const sk = d.s[k]!;
    const ik = d.i[k]!;
    const den = km * (1 + a * ik) + sk * (1 + b * ik);
    const g = den !== 0 ? (d.w[k]! * sk) / den : 0;
    const yk = d.w[k]! * d.y[k]!;
    sgg += g * g;
    sgy += g * yk;
    syy += yk * yk;
  }
  if (!(sgg > 0)) return { rss: Infinity, vmax: 0 };
  const vmax = sgy / sgg;
  return { rss: Math.max(0, syy - vmax * sgy), vmax };
}

/** Grid start for a three-parameter model: Km around the uninhibited estimate, the inhibition
 * constant on a log grid around the typical inhibitor concentration (and 0). */
function gridStart(model: Exclude<InhibitionModel, "mixed">, d: Data, km0: number, iRef: number): number[] {
  let best = { rss: Infinity, start: [1, km0, 0] as number[] };
  const kGrid = [0];
  for (let j = -4; j <= 4; j++) kGrid.push(Math.pow(10, j / 2) / iRef);
  for (const kmMul of [0.5, 1, 2]) {
    const km = km0 * kmMul;
    for (const k of kGrid) {
      const a = model === "uncompetitive" ? 0 : k;
      const b = model === "competitive" ? 0 : k;
      const pr = projectedRss(d, km, a, b);
      if (pr.rss < best.rss) best = { rss: pr.rss, start: [pr.vmax, km, k] };
    }
  }
  return best.start;
}

interface RawFit {
  theta: Float64Array;
  rss: number;
  cov: number[] | null;
  converged: boolean;
}

function fitFrom(model: InhibitionModel, d: Data, start: number[]): RawFit {
  const problem = makeProblem(model, d);
  const res = levenbergMarquardt(problem, start);
  return {
    theta: res.theta,
    rss: res.rss,
    cov: parameterCovariance(res, d.n, problem.nParams),
    converged: res.converged,
  };
}

function median(values: number[]): number {
  const v = [...values].sort((x, y) => x - y);
  const m = v.length >> 1;
  return v.length % 2 ? v[m]! : 0.5 * (v[m - 1]! + v[m]!);
}

function prepare(points: readonly MechanismPoint[], weighting: "none" | "relative"): Data {
  const rows: MechanismPoint[] = [];
  points.forEach((pt, k) => {
    const { substrate, inhibitor, rate } = pt;
    if (!Number.isFinite(substrate) || substrate < 0)
      throw new RangeError(`fitMechanism: row ${k + 1}: substrate must be a finite number ≥ 0 (got ${substrate})`);
    if (!Number.isFinite(inhibitor) || inhibitor < 0)
      throw new RangeError(`fitMechanism: row ${k + 1}: inhibitor must be a finite number ≥ 0 (got ${inhibitor})`);
    if (!Number.isFinite(rate)) throw new RangeError(`fitMechanism: row ${k + 1}: rate must be finite (got ${rate})`);
    if (weighting === "relative") {
      if (substrate === 0) return; // infinite weight; carries no information on the parameters
      if (!(rate > 0))
        throw new RangeError(`fitMechanism: row ${k + 1}: relative weighting needs a positive rate (got ${rate})`);
    }
    rows.push(pt);
  });
  const n = rows.length;
  const d: Data = { s: new Float64Array(n), i: new Float64Array(n), y: new Float64Array(n), w: new Float64Array(n), n };
  rows.forEach((r, k) => {
    d.s[k] = r.substrate;
    d.i[k] = r.inhibitor;
    d.y[k] = r.rate;
    d.w[k] = weighting === "relative" ? 1 / r.rate : 1;
  });
  return d;
}

/** Checks that a data set can support the four fits; returns a reason or null. */
export function mechanismDataProblem(points: readonly MechanismPoint[]): string | null {
  const substrates = new Set<number>();
  const inhibitors = new Set<number>();
  for (const p of points) {
    if (p.substrate > 0) substrates.add(p.substrate);
    inhibitors.add(p.inhibitor);
  }
  if (points.length < 7) return `${points.length} rows; at least 7 are needed to compare the four models`;
  if (inhibitors.size < 2) return `only one inhibitor concentration; at least 2 are needed`;
  if (substrates.size < 3)
    return `${substrates.size} distinct positive substrate concentrations; at least 3 are needed`;
  return null;
}

/**
 * Fits the four inhibition models to `points` and chooses one (see the file comment).
 * Example (isdals `inhibitor`, see mechanism-fit.test.ts): competitive Vmax 2.9383, Km 33.993,
 * Ki 34.845, chosen over mixed (F-test p = 0.0956), labelled ambiguous (ΔAICc 0.46).
 */
export function fitMechanism(points: readonly MechanismPoint[], options: MechanismOptions = {}): MechanismResult {
  const weighting = options.weighting ?? "none";
  const d = prepare(points, weighting);
  const problemText = mechanismDataProblem(
    Array.from({ length: d.n }, (_, k) => ({ substrate: d.s[k]!, inhibitor: d.i[k]!, rate: d.y[k]! })),
  );
  if (problemText) throw new RangeError(`fitMechanism: ${problemText}`);

  // Uninhibited Michaelis–Menten start from the lowest inhibitor level.
  let iMin = Infinity;
  const positiveI: number[] = [];
  for (let k = 0; k < d.n; k++) {
    iMin = Math.min(iMin, d.i[k]!);
    if (d.i[k]! > 0) positiveI.push(d.i[k]!);
  }
  const s0: number[] = [];
  const v0: number[] = [];
  const w0: number[] = [];
  for (let k = 0; k < d.n; k++) {
    if (d.i[k] === iMin) {
      s0.push(d.s[k]!);
      v0.push(d.y[k]!);
      w0.push(d.w[k]!);
    }
  }
  const [, km0] = michaelisMentenStart(s0, v0, w0);
  const iRef = positiveI.length ? median(positiveI) : 1;

  const raw = {} as Record<InhibitionModel, RawFit>;
  for (const model of ["competitive", "uncompetitive", "noncompetitive"] as const) {
    raw[model] = fitFrom(model, d, gridStart(model, d, km0, iRef));
  }
  // Mixed starts from the best nested solution: LM never increases RSS, so the mixed RSS is
  // never above any nested model's and every F statistic is ≥ 0.
  let nested: Exclude<InhibitionModel, "mixed"> = "competitive";
  for (const model of ["uncompetitive", "noncompetitive"] as const)
    if (raw[model].rss < raw[nested].rss) nested = model;
  raw.mixed = fitFrom("mixed", d, [...unpack(nested, raw[nested].theta)]);

  let syy = 0;
  for (let k = 0; k < d.n; k++) syy += (d.w[k]! * d.y[k]!) ** 2;
  const rssFloor = Math.max(1e-16 * syy, Number.MIN_VALUE); // > 0 even if every rate is 0
  const effRss = (m: InhibitionModel): number => Math.max(raw[m].rss, rssFloor);

  const aiccs = INHIBITION_MODELS.map((m) => aicc(effRss(m), d.n, MODEL_PARAMETER_COUNT[m]));
  const weights = akaikeWeights(aiccs);
  const minAicc = Math.min(...aiccs);

  const fTests = {} as Record<InhibitionModel, FTestResult | null>;
  for (const m of INHIBITION_MODELS) {
    fTests[m] = m === "mixed" ? null : extraSumOfSquaresFTest(effRss(m), d.n - 3, effRss("mixed"), d.n - 4);
  }

  const models = {} as Record<InhibitionModel, MechanismModelFit>;
  INHIBITION_MODELS.forEach((m, idx) => {
    models[m] = summarise(m, raw[m], d.n, aiccs[idx]!, aiccs[idx]! - minAicc, weights[idx]!, fTests[m]);
  });

  // Choice: lowest AICc (first in model order on ties) ...
  let best: InhibitionModel = "competitive";
  for (const m of INHIBITION_MODELS) if (models[m].aicc < models[best].aicc) best = m;
  // ... but mixed must beat the best nested model by the F-test at p < 0.05.
  if (best === "mixed") {
    let bestSimple: InhibitionModel = "competitive";
    for (const m of ["uncompetitive", "noncompetitive"] as const)
      if (models[m].aicc < models[bestSimple].aicc) bestSimple = m;
    const p = fTests[bestSimple]!.p;
    if (!(p < 0.05)) best = bestSimple;
  }
  const chosenAicc = models[best].aicc;
  const ambiguous = INHIBITION_MODELS.some((m) => m !== best && models[m].aicc - chosenAicc < 2);
  return { best, label: ambiguous ? "ambiguous" : "clear", models, n: d.n, weighting };
}

function summarise(
  model: InhibitionModel,
  f: RawFit,
  n: number,
  aiccValue: number,
  delta: number,
  weight: number,
  fTest: FTestResult | null,
): MechanismModelFit {
  const p = MODEL_PARAMETER_COUNT[model];
  const dof = n - p;
  const [vmax, km, a, b] = unpack(model, f.theta);
  const se = (k: number): number | null => {
    if (!f.cov) return null;
    const v = f.cov[k * p + k]!;
    return v >= 0 && Number.isFinite(v) ? Math.sqrt(v) : null;
  };
  const seV = se(0);
  const seKm = se(1);
  const seA = model === "uncompetitive" ? null : se(2);
  const seB = model === "competitive" ? null : model === "mixed" ? se(3) : se(2);
  const none = { value: null, se: null, ci95: [null, null] as Interval };
  const kic = model === "uncompetitive" ? none : reciprocalConstant(a, seA, dof);
  const kiu = model === "competitive" ? none : model === "noncompetitive" ? kic : reciprocalConstant(b, seB, dof);
  let alpha: number | null;
  if (model === "competitive") alpha = null;
  else if (model === "uncompetitive") alpha = 0;
  else if (model === "noncompetitive") alpha = 1;
  else alpha = b > 0 ? finiteOrNull(a / b) : null;
  return {
    model,
    nParams: p,
    vmax,
    km,
    kic: kic.value,
    kiu: kiu.value,
    alpha,
    a,
    b,
    se: { vmax: seV, km: seKm, kic: kic.se, kiu: kiu.se, a: seA, b: seB },
    ci95: { vmax: waldInterval95(vmax, seV, dof), km: waldInterval95(km, seKm, dof), kic: kic.ci95, kiu: kiu.ci95 },
    rss: f.rss,
    aicc: aiccValue,
    deltaAicc: delta,
    akaikeWeight: weight,
    fTestVsMixed: fTest,
    dof,
    converged: f.converged,
  };
}
