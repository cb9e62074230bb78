/** Small labels for QC verdicts and decisions, in words as well as colour. */
export function VerdictChip({ verdict }: { verdict: "pass" | "fail" }) {
  return (
    <span className={`chip ${verdict === "pass" ? "bg-pass-soft text-pass" : "bg-fail-soft text-fail"}`}>
      {verdict === "pass" ? "QC pass" : "QC fail"}
    </span>
  );
}

export function DecisionChip({ decision }: { decision: "pending" | "accepted" | "rejected" }) {
  const cls =
    decision === "accepted"
      ? "bg-pass-soft text-pass"
      : decision === "rejected"
        ? "bg-fail-soft text-fail"
        : "bg-paper-sunk text-ink-muted";
  return <span className={`chip ${cls}`}>{decision === "pending" ? "awaiting review" : decision}</span>;
}

export const fmtNum = (x: number | null | undefined, digits = 2) =>
  x === null || x === undefined || !Number.isFinite(x) ? "—" : x.toFixed(digits);

export function fmtSig(x: number | null | undefined, sig = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "—";
  return Number(x.toPrecision(sig)).toLocaleString("en-US", { maximumFractionDigits: 6 });
}

export const fmtDate = (d: Date | string) => new Date(d).toISOString().slice(0, 16).replace("T", " ");
