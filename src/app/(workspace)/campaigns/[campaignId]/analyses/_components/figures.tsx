import type { AdequacySummary, WeightingDecision } from "@/lib/analysis/detail";

/**
 * Small readouts shared by the result pages: adequacy (lack-of-fit F-test and runs test), the
 * weighting decision, p-values. Every number carries its unit or says it has none.
 */

/** A p-value as people read it: three significant figures, "< 0.001" below that. */
export function formatP(p: number | null | undefined): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return "—";
  if (p < 0.001) return "< 0.001";
  return p.toPrecision(2);
}

/** A false-discovery rate as a percentage without trailing zeros: 0.01 → "1". */
export const qText = (q: number) => String(Number((q * 100).toPrecision(2)));

/** p below the adequacy threshold (0.01, kinetics/adequacy.ts) is shown as a failure. */
const fails = (p: number | null | undefined) => p !== null && p !== undefined && p < 0.01;

/** Lack-of-fit F with its degrees of freedom and p, or why there is none. */
export function LackOfFitText({ a }: { a: AdequacySummary | null | undefined }) {
  if (!a) return <span className="text-ink-faint">not computed</span>;
  const l = a.lackOfFit;
  if (!l) return <span className="text-ink-muted">no replicate wells: not testable</span>;
  return (
    <span className={fails(l.p) ? "text-fail" : ""}>
      F {l.f === null ? "∞" : l.f.toPrecision(3)} on {l.dfLof}, {l.dfPe} df (dimensionless); p {formatP(l.p)}
    </span>
  );
}

/** Runs of residual signs against the number expected at random, with the one-sided p. */
export function RunsText({ a }: { a: AdequacySummary | null | undefined }) {
  if (!a) return <span className="text-ink-faint">not computed</span>;
  const r = a.runs;
  return (
    <span className={fails(r.p) ? "text-fail" : ""}>
      {r.runs} runs of residual signs, {r.expected.toFixed(1)} expected at random; p {formatP(r.p)}
    </span>
  );
}

/** Lack-of-fit F (df), p in a table cell. */
export function LackOfFitShort({ a }: { a: AdequacySummary | null | undefined }) {
  if (!a) return <span className="text-ink-faint">—</span>;
  const l = a.lackOfFit;
  if (!l) return <span className="text-ink-muted">no replicates</span>;
  return (
    <span className={fails(l.p) ? "text-fail" : ""}>
      {l.f === null ? "∞" : l.f.toPrecision(3)} ({l.dfLof}, {l.dfPe}); p {formatP(l.p)}
    </span>
  );
}

/** Runs (expected), p in a table cell. */
export function RunsShort({ a }: { a: AdequacySummary | null | undefined }) {
  if (!a) return <span className="text-ink-faint">—</span>;
  const r = a.runs;
  return (
    <span className={fails(r.p) ? "text-fail" : ""}>
      {r.runs} ({r.expected.toFixed(1)}); p {formatP(r.p)}
    </span>
  );
}

/** "adequate" or the reasons it is not. */
export function AdequacyVerdict({ a }: { a: AdequacySummary | null | undefined }) {
  if (!a) return <span className="text-ink-faint">—</span>;
  if (a.adequate) return <span className="text-pass">no sign of misfit at p &lt; 0.01</span>;
  return <span className="text-fail">inadequate: {a.reasons.join("; ")}</span>;
}

const weightingName = { none: "none (equal weights)", relative: "relative (1/Ŷ², SD ∝ signal)" } as const;

/** The weighting in a table cell: which, and whether set or chosen. */
export function WeightingShort({ w }: { w: WeightingDecision | null | undefined }) {
  if (!w) return <span className="text-ink-faint">—</span>;
  return (
    <span>
      {w.used === "none" ? "none" : "relative 1/Ŷ²"}, {w.chosen === "auto" ? "chosen from replicates" : "set"}
    </span>
  );
}

/** Which weighting the fit used, whether it was set or chosen from the replicates, and why. */
export function WeightingText({
  w,
  fallback,
}: {
  w: WeightingDecision | null | undefined;
  fallback?: "none" | "relative";
}) {
  if (!w)
    return fallback ? (
      <span>{weightingName[fallback]}, set by the experiment</span>
    ) : (
      <span className="text-ink-faint">—</span>
    );
  return (
    <span>
      {weightingName[w.used]}, {w.chosen === "auto" ? "chosen from the replicate scatter" : "set by the experiment"}
      {w.reason ? <span className="text-ink-muted">: {w.reason}</span> : null}
    </span>
  );
}
