import { mechanismLabelNote } from "@/lib/hits/mechanism-label";
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

export function MechanismCell({
  mechanism,
  label,
  flags = [],
}: {
  mechanism: string | null;
  label: string | null;
  flags?: readonly string[];
}) {
  if (!mechanism) return <span className="text-ink-faint">—</span>;
  const note = mechanismLabelNote(label, flags);
  return (
    <span className="flex flex-wrap items-center gap-1">
      <span>{mechanism}</span>
      {note?.label === "inadequate" ? (
        // A call the data do not support: outlined, so it reads apart from the warning chips; the reason on hover.
        <span className="chip border border-fail/40 bg-fail-soft text-fail" title={note.why} aria-label={note.why}>
          inadequate
        </span>
      ) : null}
      {note?.label === "ambiguous" ? (
        <span className="chip bg-warn-soft text-warn" title={note.why}>
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
