/**
 * From a parsed reader export and its plate map to well readings, plate QC and % inhibition.
 * Pure: the statistics come from the kinetics engine (plate-statistics, normalization,
 * initial-rate); this module only decides which wells feed them.
 *
 * - Every non-empty well of the plate map must have a reading; readings of wells the map leaves
 *   empty are kept for the heatmap (plate readers read every well) but never normalised.
 * - Kinetic runs: each well's signal is its initial rate (signal units per second) from
 *   `initialRate`, with its R², window and linearity flag.
 * - QC uses the unmasked control wells: Z′, robust Z′, S/B, signal window, CV of each control
 *   group (kinetics engine), the readout direction, and an edge check (outer ring vs inner wells,
 *   common practice; flagged above a 10 % difference, a threshold chosen here, no source).
 * - Verdict: pass when Z′ ≥ the campaign's minimum, each control CV ≤ its maximum, and the
 *   controls read in the direction the plate map says. The CV limit is not applied to a control
 *   group whose mean lies within 3 SD of zero (e.g. the no-enzyme rate of a kinetic run), where a
 *   CV has no meaning (common practice).
 * - % inhibition = 100·(μneutral − x)/(μneutral − μfull) against the run's own unmasked controls.
 */
import { initialRate, type InitialRate } from "../kinetics/initial-rate";
import { percentInhibition } from "../kinetics/normalization";
import { plateQuality, summarizeControls, type ControlSummary } from "../kinetics/plate-statistics";
import { isEdgeWell, parseWellName, plateDimensions, wellIndex } from "./geometry";
import { issue, MAX_ISSUES, type PlateIssue } from "./issues";
import type { PlateMap, WellRole } from "./plate-map";
import type { KineticExport, ReaderExport } from "./reader-export";

/** Whether the readout falls or rises with inhibition (the plate map says which; the database enum is built from it). */
export const SIGNAL_DIRECTIONS = ["falls", "rises"] as const;
export type SignalDirection = (typeof SIGNAL_DIRECTIONS)[number];
/** A plate run's review state, and the two decisions a person can take. */
export const RUN_DECISIONS = ["pending", "accepted", "rejected"] as const;
export const REVIEW_DECISIONS = ["accepted", "rejected"] as const;
export const QC_VERDICTS = ["pass", "fail"] as const;
export type Readout = "endpoint" | "kinetic";

export interface RunReading {
  readonly well: string;
  readonly wellIndex: number;
  readonly role: WellRole;
  readonly compoundId: string | null;
  readonly concentrationUm: number | null;
  readonly substrateUm: number | null;
  readonly replicateGroup: string | null;
  readonly isEdge: boolean;
  /** endpoint value (null for kinetic runs) */
  readonly value: number | null;
  readonly rate: Pick<InitialRate, "slope" | "rSquared" | "curved" | "progress" | "startTime" | "endTime"> | null;
  readonly series: { timesS: number[]; values: number[] } | null;
  /** what QC and % inhibition use: the value, or the initial rate */
  readonly signal: number;
}

export type BuildReadingsResult =
  | { readonly ok: true; readonly readout: Readout; readonly readings: RunReading[] }
  | { readonly ok: false; readonly issues: PlateIssue[] };

/** Minimum reads per well for an initial rate (the kinetics engine's default window). */
export const MIN_KINETIC_READS = 4;

/**
 * Check an export against its plate map and turn it into readings (initial rates for kinetic
 * runs). The export must already have been parsed with the map's format.
 */
export function buildReadings(map: PlateMap, exp: ReaderExport): BuildReadingsResult {
  const issues: PlateIssue[] = [];
  const add = (well: string, message: string) => {
    if (issues.length < MAX_ISSUES) issues.push(issue({ file: exp.fileName, well }, message));
  };
  if (exp.format !== map.format) {
    return {
      ok: false,
      issues: [
        issue(
          { file: exp.fileName },
          `the export is a ${exp.format}-well plate but the plate map is ${map.format}-well`,
        ),
      ],
    };
  }
  for (const w of map.wells) {
    if (w.role !== "empty" && !exp.wells.has(w.well))
      add(w.well, `the plate map has a ${roleWord(w.role)} well here but the export has no reading for it`);
  }
  if (issues.length > 0) return { ok: false, issues };
  const readings: RunReading[] = [];
  const baseOf = (well: string) => {
    const pos = parseWellName(well)!;
    const idx = wellIndex(pos, map.format);
    const m = map.wells[idx]!;
    return {
      well,
      wellIndex: idx,
      role: m.role,
      compoundId: m.compound ?? null,
      concentrationUm: m.concentrationUm ?? null,
      substrateUm: m.substrateUm ?? null,
      replicateGroup: m.group ?? null,
      isEdge: isEdgeWell(pos, map.format),
    };
  };
  if (!isKinetic(exp)) {
    for (const [well, value] of exp.wells)
      readings.push({ ...baseOf(well), value, rate: null, series: null, signal: value });
  } else {
    for (const [well, pts] of exp.wells) {
      const timesS = pts.map((p) => p.timeS);
      const values = pts.map((p) => p.value);
      if (pts.length < MIN_KINETIC_READS) {
        add(well, `well has ${pts.length} reads; an initial rate needs at least ${MIN_KINETIC_READS}`);
        continue;
      }
      let r: InitialRate;
      try {
        r = initialRate(timesS, values);
      } catch (e) {
        add(well, `no initial rate: ${e instanceof Error ? e.message : String(e)}`);
        continue;
      }
      readings.push({
        ...baseOf(well),
        value: null,
        rate: {
          slope: r.slope,
          rSquared: r.rSquared,
          curved: r.curved,
          progress: r.progress,
          startTime: r.startTime,
          endTime: r.endTime,
        },
        series: { timesS, values },
        signal: r.slope,
      });
    }
  }
  if (issues.length > 0) return { ok: false, issues };
  readings.sort((a, b) => a.wellIndex - b.wellIndex);
  return { ok: true, readout: isKinetic(exp) ? "kinetic" : "endpoint", readings };
}

function isKinetic(exp: ReaderExport): exp is KineticExport {
  return exp.shape === "long-kinetic" || exp.shape === "grid-kinetic";
}

function roleWord(role: WellRole): string {
  return role === "full" ? "full-inhibition control" : role === "neutral" ? "neutral control" : role;
}

export interface ControlFigures {
  readonly n: number;
  readonly mean: number;
  readonly sd: number | null;
  readonly cvPct: number | null;
  readonly median: number;
  /** true when the CV limit applies (mean not within 3 SD of zero) */
  readonly cvApplies: boolean;
}

export interface EdgeCheck {
  /** which wells were compared: the neutral controls when they sit both on and off the edge, else the samples */
  readonly basis: "neutral" | "sample";
  readonly outerWells: number;
  readonly innerWells: number;
  readonly outerMedian: number;
  readonly innerMedian: number;
  /** 100·(outer − inner)/|inner| */
  readonly differencePct: number;
  readonly flagged: boolean;
}

export interface RunQc {
  readonly readout: Readout;
  /** "signal units" for endpoint runs, "signal units/s" for initial rates */
  readonly signalUnit: string;
  readonly neutral: ControlFigures | null;
  readonly full: ControlFigures | null;
  readonly zPrime: number | null;
  readonly robustZPrime: number | null;
  readonly signalToBackground: number | null;
  readonly signalWindow: number | null;
  readonly cvNeutralPct: number | null;
  readonly cvFullPct: number | null;
  readonly direction: {
    readonly expected: SignalDirection;
    readonly observed: SignalDirection | null;
    readonly ok: boolean;
  };
  readonly edge: EdgeCheck | null;
  readonly thresholds: { readonly minZPrime: number; readonly maxCvPct: number };
  readonly verdict: "pass" | "fail";
  /** why the verdict is fail, and warnings that do not change it (edge effect, curved progress) */
  readonly reasons: string[];
  readonly warnings: string[];
  readonly maskedWells: number;
  readonly nonLinearWells: number;
}

export interface QcInputWell {
  readonly well: string;
  readonly role: WellRole;
  readonly signal: number | null;
  readonly isEdge: boolean;
  readonly masked: boolean;
  readonly rateLinear?: boolean | null;
}

export interface QcOptions {
  readonly readout: Readout;
  readonly direction: SignalDirection;
  readonly minZPrime: number;
  readonly maxCvPct: number;
}

/** Edge-effect flag: outer ring differs from inner wells by more than this (common practice; chosen here). */
export const EDGE_FLAG_PCT = 10;

function figures(s: ControlSummary): ControlFigures {
  return {
    n: s.n,
    mean: s.mean,
    sd: s.sd,
    cvPct: s.cvPercent,
    median: s.median,
    cvApplies: s.sd === null ? true : Math.abs(s.mean) > 3 * s.sd,
  };
}

function medianOf(xs: number[]): number {
  return summarizeControls(xs).median;
}

function edgeCheck(wells: readonly QcInputWell[]): EdgeCheck | null {
  const pick = (role: WellRole) =>
    wells.filter((w) => w.role === role && !w.masked && w.signal !== null && Number.isFinite(w.signal));
  const neutral = pick("neutral");
  const try_ = (basis: EdgeCheck["basis"], list: QcInputWell[]): EdgeCheck | null => {
    const outer = list.filter((w) => w.isEdge).map((w) => w.signal!);
    const inner = list.filter((w) => !w.isEdge).map((w) => w.signal!);
    if (outer.length < 2 || inner.length < 2) return null;
    const outerMedian = medianOf(outer);
    const innerMedian = medianOf(inner);
    if (innerMedian === 0) return null;
    const differencePct = (100 * (outerMedian - innerMedian)) / Math.abs(innerMedian);
    return {
      basis,
      outerWells: outer.length,
      innerWells: inner.length,
      outerMedian,
      innerMedian,
      differencePct,
      flagged: Math.abs(differencePct) > EDGE_FLAG_PCT,
    };
  };
  return try_("neutral", neutral) ?? try_("sample", pick("sample"));
}

const fmt = (x: number, d = 2) => x.toFixed(d);

/**
 * Plate QC of a run and % inhibition of each well (null where it cannot be computed: no
 * signal, an empty well, or controls that do not define a span).
 */
export function computeRunQc(
  wells: readonly QcInputWell[],
  o: QcOptions,
): { qc: RunQc; inhibitionPct: Map<string, number | null> } {
  const reasons: string[] = [];
  // NaN or ±Infinity signals (a rate over a zero time span, an overflow) are left out of every
  // figure and fail the plate with their wells named.
  const nonFinite = wells.filter((w) => w.signal !== null && !w.masked && !Number.isFinite(w.signal));
  if (nonFinite.length > 0)
    reasons.push(
      `${nonFinite.length} well${nonFinite.length > 1 ? "s have a signal" : " has a signal"} that is not a finite number (${nonFinite
        .slice(0, 5)
        .map((w) => w.well)
        .join(", ")}${nonFinite.length > 5 ? ", …" : ""}), so the plate cannot pass QC`,
    );
  const live = (role: WellRole) =>
    wells
      .filter((w) => w.role === role && !w.masked && w.signal !== null && Number.isFinite(w.signal))
      .map((w) => w.signal!);
  const neutralValues = live("neutral");
  const fullValues = live("full");
  const warnings: string[] = [];
  let neutral: ControlFigures | null = null;
  let full: ControlFigures | null = null;
  let zPrime: number | null = null;
  let robustZPrime: number | null = null;
  let signalToBackground: number | null = null;
  let signalWindow: number | null = null;
  if (neutralValues.length < 2 || fullValues.length < 2) {
    reasons.push(
      `QC needs at least 2 unmasked wells of each control; there are ${neutralValues.length} neutral and ${fullValues.length} full-inhibition`,
    );
    if (neutralValues.length > 0) neutral = figures(summarizeControls(neutralValues));
    if (fullValues.length > 0) full = figures(summarizeControls(fullValues));
  } else {
    const q = plateQuality(neutralValues, fullValues);
    neutral = figures(q.neutral);
    full = figures(q.fullInhibition);
    zPrime = q.zPrime;
    robustZPrime = q.robustZPrime;
    signalToBackground = q.signalToBackground;
    signalWindow = q.signalWindow;
    if (zPrime === null)
      reasons.push("the neutral and full-inhibition controls have the same mean, so Z′ is undefined");
    else if (zPrime < o.minZPrime) reasons.push(`Z′ ${fmt(zPrime)} is below the campaign's minimum of ${o.minZPrime}`);
    for (const [label, f] of [
      ["neutral", neutral],
      ["full-inhibition", full],
    ] as const) {
      if (!f.cvApplies) {
        warnings.push(
          `the ${label} controls' mean is within 3 SD of zero, so their CV is not held to the ${o.maxCvPct} % limit`,
        );
      } else if (f.cvPct === null || f.cvPct > o.maxCvPct) {
        reasons.push(
          `CV of the ${label} controls ${f.cvPct === null ? "is undefined" : `${fmt(f.cvPct, 1)} %`} is above the campaign's maximum of ${o.maxCvPct} %`,
        );
      }
    }
  }
  let observed: SignalDirection | null = null;
  if (neutral && full && neutral.mean !== full.mean) observed = neutral.mean > full.mean ? "falls" : "rises";
  const directionOk = observed === null || observed === o.direction;
  if (!directionOk) {
    reasons.push(
      o.direction === "falls"
        ? "the neutral controls read lower than the full-inhibition controls, but this plate map's signal falls with inhibition: are the controls swapped?"
        : "the neutral controls read higher than the full-inhibition controls, but this plate map's signal rises with inhibition: are the controls swapped?",
    );
  }
  const edge = edgeCheck(wells);
  if (edge?.flagged)
    warnings.push(
      `edge effect: the outer ring's ${edge.basis} wells read ${fmt(edge.differencePct, 1)} % against the inner ones (median)`,
    );
  const nonLinearWells =
    o.readout === "kinetic" ? wells.filter((w) => w.role !== "empty" && w.rateLinear === false).length : 0;
  if (nonLinearWells > 0)
    warnings.push(
      `${nonLinearWells} wells have a curved progress curve; their initial rate uses the early linear window only`,
    );

  // A figure that is NaN or ±Infinity (readings that overflow, a degenerate SD) compares false
  // with every threshold, so without this check it would pass QC silently: it fails with its
  // reason and is stored as null.
  const finite = (label: string, x: number | null): number | null => {
    if (x === null || Number.isFinite(x)) return x;
    reasons.push(
      `${label} is not a finite number (${String(x)}), so the plate cannot pass QC; check the control readings`,
    );
    return null;
  };
  zPrime = finite("Z′", zPrime);
  robustZPrime = finite("robust Z′", robustZPrime);
  signalToBackground = finite("S/B", signalToBackground);
  signalWindow = finite("the signal window", signalWindow);
  const cvNeutralPct = finite("CV of the neutral controls", neutral?.cvPct ?? null);
  const cvFullPct = finite("CV of the full-inhibition controls", full?.cvPct ?? null);
  for (const [label, f] of [
    ["neutral", neutral],
    ["full-inhibition", full],
  ] as const)
    if (f && (!Number.isFinite(f.mean) || (f.sd !== null && !Number.isFinite(f.sd))))
      reasons.push(`the ${label} controls' mean or SD is not a finite number, so the plate cannot pass QC`);

  const inhibitionPct = new Map<string, number | null>();
  const canNormalise =
    neutral !== null && full !== null && neutral.mean !== full.mean && Number.isFinite(neutral.mean - full.mean);
  for (const w of wells) {
    const pct =
      canNormalise && w.role !== "empty" && w.signal !== null && Number.isFinite(w.signal)
        ? percentInhibition(w.signal, neutral!.mean, full!.mean)
        : null;
    inhibitionPct.set(w.well, pct !== null && Number.isFinite(pct) ? pct : null);
  }
  const qc: RunQc = {
    readout: o.readout,
    signalUnit: o.readout === "kinetic" ? "signal units/s" : "signal units",
    neutral,
    full,
    zPrime,
    robustZPrime,
    signalToBackground,
    signalWindow,
    cvNeutralPct,
    cvFullPct,
    direction: { expected: o.direction, observed, ok: directionOk },
    edge,
    thresholds: { minZPrime: o.minZPrime, maxCvPct: o.maxCvPct },
    verdict: reasons.length === 0 ? "pass" : "fail",
    reasons,
    warnings,
    maskedWells: wells.filter((w) => w.masked).length,
    nonLinearWells,
  };
  return { qc, inhibitionPct };
}

/** Rows × columns of a plate, for heatmaps. */
export function plateGrid(format: PlateMap["format"]): { rows: number; columns: number } {
  const d = plateDimensions(format);
  return { rows: d.rows, columns: d.columns };
}
