/**
 * Analysis settings shared by the pipeline, the command and the forms, without zod (so the
 * command's bundle stays small). The zod schema of an experiment's settings is in
 * src/lib/validation/experiments.ts.
 */

/**
 * How the fits weight their points: "auto" decides from the replicate wells (relative weighting
 * 1/Ŷ² when their SD grows with the signal, else none), "none" is ordinary least squares and
 * "relative" divides each residual by the fitted value. The default is "auto".
 */
export const ANALYSIS_WEIGHTINGS = ["auto", "none", "relative"] as const;
export type AnalysisWeighting = (typeof ANALYSIS_WEIGHTINGS)[number];
export const DEFAULT_ANALYSIS_WEIGHTING: AnalysisWeighting = "auto";

/** False-discovery rate Q of the outlier proposals (ROUT; Motulsky & Brown 2006 suggest 1 % [from memory]). */
export const OUTLIER_Q = 0.01;

/** The part of an analysis's recorded settings the fits read (structural: the column type lives in server/db). */
export type RecordedFitSettings = {
  fixTopPct?: number | null;
  fixBottomPct?: number | null;
  weighting?: AnalysisWeighting | null;
  robust?: boolean | null;
  resolved: { weighting?: AnalysisWeighting | null; robust?: boolean | null; enzymeNm: number | null };
};

/**
 * The engine options of an analysis from its recorded settings: the one mapping used by the
 * pipeline and by the result page's in-browser preview, so the preview is what the next analysis
 * stores. Inputs recorded before weighting and robust were resolved: unweighted unless set, not robust.
 */
export function engineOptionsFrom(s: RecordedFitSettings) {
  const weighting = s.resolved.weighting ?? s.weighting ?? "none";
  const robust = s.resolved.robust ?? s.robust ?? false;
  const enzymeUm = s.resolved.enzymeNm !== null ? s.resolved.enzymeNm / 1000 : null;
  return {
    doseResponse: {
      fixTopPct: s.fixTopPct ?? null,
      fixBottomPct: s.fixBottomPct ?? null,
      enzymeUm,
      weighting,
      robust,
      wording: { concentrationUnit: "µM", wells: true },
    },
    // The app's concentrations are µM and its rows wells: the sentences say so (the command words its own units).
    mechanism: { weighting, enzymeUm, robust, wording: { concentrationUnit: "µM", wells: true } },
  };
}
