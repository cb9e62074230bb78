export const kindLabel = {
  "single-dose": "Single-dose screen",
  "dose-response": "Dose-response",
  mechanism: "Mechanism study",
} as const;

export function AnalysisStatusChip({
  status,
  progress,
}: {
  status: "queued" | "running" | "done" | "failed";
  progress: number;
}) {
  if (status === "done") return <span className="chip bg-pass-soft text-pass">done</span>;
  if (status === "failed") return <span className="chip bg-fail-soft text-fail">failed</span>;
  if (status === "queued") return <span className="chip bg-paper-sunk text-ink-muted">queued</span>;
  return <span className="chip bg-info-soft text-info">running {Math.round(progress * 100)} %</span>;
}

const flagText: Record<string, string> = {
  "ic50-above-range": "IC50 above the tested range",
  "ic50-below-range": "IC50 below the tested range",
  "plateau-not-reached": "a plateau is not reached",
  "hill-outside-0.5-2": "Hill slope outside 0.5–2",
  "ci-wider-than-10-fold": "IC50 CI wider than 10-fold",
  "too-few-points": "too few points",
  "poor-fit": "poor fit (R² < 0.8)",
  "not-converged": "fit did not converge",
  "partial-inhibition": "partial inhibition: levels off well below 100 %",
  "baseline-offset": "baseline far from 0 %",
  "tight-binding-suspected": "tight binding suspected (IC50 < 10·[E] or steep)",
  "activation-not-inhibition": "signal rises: activation, not inhibition",
  "ambiguous-mechanism": "another model within ΔAICc 2",
  "ki-ci-wider-than-10-fold": "Ki CI wider than 10-fold",
  "ki-ci-unbounded": "Ki CI unbounded",
  "ki-above-tested-range": "Ki above 3 × the highest [I]",
  "cheng-prusoff-disagreement": "Cheng–Prusoff: predicted and measured IC50 differ > 3-fold",
  "fit-failed": "fit failed",
  "single-well": "one well only",
  "replicates-disagree": "replicates differ (SD > 20 %)",
  inactive: "inactive: < 50 % inhibition at the top concentration",
  activator: "activator: the signal rises",
  "not-determined": "IC50 not determined",
  "steep-step": "steep step: no IC50 reported from it",
  "inadequate-fit": "model inadequate (lack of fit or residual pattern, p < 0.01)",
  "mechanism-inadequate": "chosen mechanism inadequate",
  "no-adequate-model": "no model tried fits adequately",
  "substrate-inhibition": "substrate inhibition (rates fall at high [S])",
  "tight-binding": "tight binding: Ki may be underestimated, mechanism unreliable",
  "noise-grows-with-rate": "noise grows with the rate",
  "weighting-sensitive": "call depends on the weighting",
  "relative-weighting": "relative weighting (SD ∝ signal)",
  "outliers-proposed": "outliers proposed (ROUT), not dropped",
  "outliers-excluded": "proposed outliers left out (robust fit on)",
};

export function Flags({ flags }: { flags: string[] }) {
  if (flags.length === 0) return <span className="text-ink-faint">—</span>;
  return (
    <span className="flex flex-wrap gap-1">
      {flags.map((f) => (
        <span key={f} className="chip bg-warn-soft text-warn" title={flagText[f] ?? f}>
          {flagText[f] ?? f}
        </span>
      ))}
    </span>
  );
}
