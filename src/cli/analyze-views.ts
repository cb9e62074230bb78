/**
 * What the `analyze` command prints for one compound: the result of the pipeline's own
 * per-compound analysis (src/lib/analysis/compute.ts) with the app's µM/% field names turned into
 * the file's own units (the command takes any one concentration unit). Every field is documented
 * in docs/science.md. A compound that cannot be fitted becomes `{"compound", "error"}`.
 */
import {
  analyseDoseResponseSeries,
  analyseMechanismCompound,
  type CompoundResult,
  type DoseResponseScale,
  type MechanismInputPoint,
} from "../lib/analysis/compute";
import type {
  AlternativeModel,
  DoseResponseCalledDetail,
  DoseResponseFittedDetail,
  MechanismFittedDetail,
  ModelSummary,
} from "../lib/analysis/detail";
import type { AnalysisWeighting } from "../lib/analysis/settings";
import type { MechanismPoint } from "../lib/kinetics/mechanism-fit";

/** The command's options as the views need them. */
export interface ViewOptions {
  weighting: AnalysisWeighting;
  robust: boolean;
  enzyme: number | null;
  fixTop: number | null;
  fixBottom: number | null;
  response: DoseResponseScale;
  /** The concentration unit the file's header names ("µM"), for the sentences; null: bare numbers. */
  concentrationUnit: string | null;
}

export interface DoseJob {
  compound: string;
  x: number[];
  y: number[];
  /** File line of each point. */
  lines: number[];
}

export interface MechanismJob {
  /** null: the whole file is one data set (no compound column). */
  compound: string | null;
  points: (MechanismPoint & { line: number })[];
}

/** A compound's own error: the rest of the batch is still fitted. */
export class CompoundError extends Error {}

const lineSpan = (lines: readonly number[]): string => {
  const lo = Math.min(...lines);
  const hi = Math.max(...lines);
  return lo === hi ? `line ${lo}` : `lines ${lo}–${hi}`;
};

const messageOf = (e: unknown): string => (e instanceof Error ? e.message : String(e));

// ---------------------------------------------------------------- dose-response

type Fit = DoseResponseFittedDetail["fit"];

/** The 4PL as fitted; `full` adds what the compound's own fields already say (for the other fit). */
function fitView(f: Fit | null, full = false) {
  if (!f) return null;
  const own = {
    ic50: f.ic50Um,
    ic50Ci95: f.ic50Ci95Um,
    log10Ic50: f.log10Ic50,
    log10Ic50Se: f.log10Ic50Se,
    hillSe: f.hillSe,
    direction: f.direction,
    rss: f.rss,
    rSquared: f.rSquared,
    dof: f.dof,
    converged: f.converged,
  };
  return full ? { ...own, hill: f.hill, top: f.topPct, bottom: f.bottomPct } : own;
}

function doseOutliersView(o: DoseResponseCalledDetail["outliers"] | undefined) {
  if (!o) return null;
  return {
    q: o.q,
    proposed: o.proposed.map((p) => ({
      line: Number(p.well),
      concentration: p.concentrationUm,
      response: p.inhibitionPct,
      residual: p.residual,
      p: p.p,
    })),
    reported: o.reported,
    other: o.other
      ? { basis: o.other.basis, outcome: o.other.outcome, reason: o.other.reason, fit: fitView(o.other.fit, true) }
      : null,
  };
}

function morrisonView(m: DoseResponseFittedDetail["morrison"]) {
  if (!m) return null;
  if ("error" in m) return { error: m.error };
  return {
    enzyme: m.enzymeUm,
    kApp: m.kAppUm,
    kAppCi95: m.kAppCi95Um,
    ic50: m.ic50Um,
    rss: m.rss,
    converged: m.converged,
  };
}

/** One dose-response compound as printed (keys in a fixed order; null where not applicable). */
export function doseResponseView(compound: string, r: CompoundResult) {
  const d = r.detail as DoseResponseFittedDetail | DoseResponseCalledDetail;
  const fitted = "fit" in d;
  const called = fitted ? null : d;
  return {
    compound,
    outcome: fitted ? "fitted" : d.outcome,
    reason: called?.reason ?? null,
    ic50: r.ic50Um ?? null,
    ic50Qualifier: r.ic50Qualifier ?? null,
    ic50Ci95: [r.ic50LoUm ?? null, r.ic50HiUm ?? null],
    hill: r.hill ?? null,
    top: fitted ? d.fit.topPct : null,
    bottom: fitted ? d.fit.bottomPct : null,
    maxInhibition: d.maxInhibitionPct ?? null,
    maxActivation: called?.maxActivationPct ?? null,
    ic50Bracket: called?.ic50BracketUm ?? null,
    testedRange: d.testedRangeUm ?? null,
    fixed: fitted ? { top: d.fixed.topPct, bottom: d.fixed.bottomPct } : null,
    flags: r.flags,
    weighting: d.weighting ?? null,
    adequacy: d.adequacy ?? null,
    outliers: doseOutliersView(d.outliers),
    morrison: fitted ? morrisonView(d.morrison) : null,
    fit: fitted ? fitView(d.fit) : null,
  };
}

export function doseResponseJobView(job: DoseJob, o: ViewOptions) {
  let r: CompoundResult;
  try {
    // The well of a point is its file line, so outliers can name it.
    r = analyseDoseResponseSeries(job.compound, job.x, job.y, (k) => ["", String(job.lines[k])], {
      omitPoints: true,
      weighting: o.weighting,
      robust: o.robust,
      enzymeUm: o.enzyme,
      fixTopPct: o.fixTop,
      fixBottomPct: o.fixBottom,
      response: o.response,
      ...(o.concentrationUnit ? { wording: { concentrationUnit: o.concentrationUnit, wells: false } } : {}),
    });
  } catch (e) {
    return { compound: job.compound, error: `${lineSpan(job.lines)}: ${messageOf(e)}` };
  }
  if (r.flags.includes("too-few-points")) {
    const reason = (r.detail as DoseResponseCalledDetail).reason;
    const last = Math.max(...job.lines);
    return { compound: job.compound, error: `line ${last}, column "concentration": ${reason}` };
  }
  return doseResponseView(job.compound, r);
}

// ---------------------------------------------------------------- mechanism

function modelView(m: ModelSummary) {
  return {
    vmax: m.vmax,
    km: m.kmUm,
    kic: m.kicUm,
    kiu: m.kiuUm,
    alpha: m.alpha,
    rss: m.rss,
    aicc: m.aicc,
    deltaAicc: m.deltaAicc,
    akaikeWeight: m.akaikeWeight,
    fTestVsMixed: m.fTestVsMixedP === null ? null : { f: m.fTestVsMixedF ?? null, p: m.fTestVsMixedP },
    se: { vmax: m.se.vmax, km: m.se.km, kic: m.se.kic, kiu: m.se.kiu, a: m.se.a, b: m.se.b },
    ci95: m.ci95,
    dof: m.dof,
    converged: m.converged,
    adequacy: m.adequacy ?? null,
  };
}

/** kmUm → km, kicUm → kic, …: the command's constants are in the file's unit. */
const plainName = (k: string): string => (k.endsWith("Um") ? k.slice(0, -2) : k);

/** An alternative model; `unit` is the file's concentration unit (null: "concentration"). */
function alternativeView(a: AlternativeModel, unit: string | null) {
  return {
    model: a.model,
    name: a.name,
    meaning: a.meaning,
    constants: Object.fromEntries(
      Object.entries(a.constants).map(([k, c]) => [
        plainName(k),
        // The app's "µM" is the file's own unit here; "rate" and a ratio's "" stay.
        {
          value: c.value,
          se: c.se,
          ci95: c.ci95,
          unit: c.unit === "µM" ? (unit ?? "concentration") : c.unit,
          fixed: c.fixed === true,
        },
      ]),
    ),
    residualActivity: a.residualActivity ?? null,
    enzyme: a.enzymeUm ?? null,
    rss: a.rss,
    aicc: a.aicc,
    deltaAicc: a.deltaAicc,
    dof: a.dof,
    converged: a.converged,
    adequacy: a.adequacy,
    exclusion: a.exclusion ?? null,
  };
}

/** One mechanism data set as printed; `lines` maps a point index back to its file line. */
export function mechanismView(r: CompoundResult, lines: readonly number[], unit: string | null = null) {
  const d = r.detail as MechanismFittedDetail;
  const o = d.outliers;
  const s = d.screens;
  return {
    best: d.best,
    label: d.label,
    n: d.n,
    labelReasons: d.labelReasons ?? [],
    recommended: d.recommended ?? null,
    recommendedReason: d.recommendedReason ?? null,
    mechanism: r.mechanism ?? null,
    ki: r.kiUm ?? null,
    kiCi95: [r.kiLoUm ?? null, r.kiHiUm ?? null],
    kic: r.kicUm ?? null,
    kiu: r.kiuUm ?? null,
    alpha: r.alpha ?? null,
    flags: r.flags,
    weighting: d.weightingDecision ?? { used: d.weighting, chosen: "set", reason: "" },
    enzyme: d.enzymeUm ?? null,
    backgroundSubtracted: d.backgroundSubtracted,
    models: Object.fromEntries(Object.entries(d.models).map(([m, v]) => [m, modelView(v)])),
    alternatives: (d.alternatives ?? []).map((a) => alternativeView(a, unit)),
    screens: s
      ? {
          substrateInhibition: s.substrateInhibition,
          partial: s.partial,
          tightBinding: s.tightBinding
            ? {
                enzyme: s.tightBinding.enzymeUm,
                kiMin: s.tightBinding.kiMinUm,
                kiOverEnzyme: s.tightBinding.kiOverEnzyme,
                near: s.tightBinding.near,
              }
            : null,
          fitted: s.fitted,
        }
      : null,
    outliers: o
      ? {
          checked: o.checked,
          largestStandardized: o.largestStandardized,
          model: o.model,
          q: o.q,
          proposed: o.proposed.map((p) => ({
            line: lines[Number(p.well)] ?? null,
            substrate: p.substrateUm,
            inhibitor: p.inhibitorUm,
            rate: p.rate,
            residual: p.residual,
            p: p.p,
          })),
          reported: o.reported,
          callWithout: o.callWithout,
          kiWithout: o.kiWithoutUm,
        }
      : null,
  };
}

/**
 * One mechanism data set: its view, or for a batch compound `{compound, error}`. For the whole
 * file as one data set, a set that cannot be fitted throws CompoundError (the command exits 2).
 */
export function mechanismJobView(job: MechanismJob, o: ViewOptions) {
  const lines = job.points.map((p) => p.line);
  // The well of a point is its index, mapped back to its file line in the view.
  const pts: MechanismInputPoint[] = job.points.map((p, k) => ({
    substrate: p.substrate,
    inhibitor: p.inhibitor,
    rate: p.rate,
    runId: "",
    well: String(k),
  }));
  let r: CompoundResult;
  let failure: string | null = null;
  try {
    r = analyseMechanismCompound(job.compound ?? "", pts, {
      weighting: o.weighting,
      robust: o.robust,
      enzymeUm: o.enzyme,
      ...(o.concentrationUnit ? { wording: { concentrationUnit: o.concentrationUnit, wells: false } } : {}),
    });
    const d = r.detail;
    if ("error" in d) failure = d.error.replace(/^fitMechanism: /, "");
    else if ("reason" in d && !("models" in d)) failure = `too few points: ${d.reason}`;
  } catch (e) {
    failure = messageOf(e);
    r = null as never;
  }
  if (failure !== null) {
    const message = `${lineSpan(lines)}: ${failure}`;
    if (job.compound === null) throw new CompoundError(message);
    return { compound: job.compound, error: message };
  }
  const view = mechanismView(r, lines, o.concentrationUnit);
  return job.compound === null ? view : { compound: job.compound, ...view };
}
