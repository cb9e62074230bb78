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
