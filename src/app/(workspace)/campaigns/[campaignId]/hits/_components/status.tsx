import { isTriageStatus, triageLabels, type TriageStatus } from "@/lib/hits/query";

// Our own palette for the triage states: neutral until reviewed, then blue (confirmed), green
// (advance), amber (on hold), struck grey (dropped).
const look: Record<TriageStatus, string> = {
  unreviewed: "bg-paper-sunk text-ink-muted",
  confirmed: "bg-info-soft text-info",
  advance: "bg-pass-soft text-pass",
  "on-hold": "bg-warn-soft text-warn",
  dropped: "bg-paper-sunk text-ink-faint line-through",
};

export function StatusChip({ status }: { status: string }) {
  if (!isTriageStatus(status)) return <span className="chip">{status}</span>;
  return <span className={`chip ${look[status]}`}>{triageLabels[status]}</span>;
}

export function MechanismCell({ mechanism, label }: { mechanism: string | null; label: string | null }) {
  if (!mechanism) return <span className="text-ink-faint">—</span>;
  return (
    <span className="flex flex-wrap items-center gap-1">
      <span>{mechanism}</span>
      {label === "ambiguous" ? (
        <span className="chip bg-warn-soft text-warn" title="Another model lies within ΔAICc 2">
          ambiguous
        </span>
      ) : null}
      {label === "override" ? (
        <span className="chip bg-info-soft text-info" title="Model chosen by a person, with a reason (audited)">
          override
        </span>
      ) : null}
    </span>
  );
}
