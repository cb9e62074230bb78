/** The cautions the product shows where work can hurt someone or mislead a decision. */
export function ResearchUseNote({ className = "" }: { className?: string }) {
  return (
    <p className={`text-2xs text-ink-muted ${className}`}>
      Research use only. Potency and mechanism calls depend on assay conditions and must be reviewed by a qualified
      scientist before decisions; fits flagged as poor are never ranked silently.
    </p>
  );
}

export function ChemicalSafetyNote({ className = "" }: { className?: string }) {
  return (
    <div
      role="note"
      className={`rounded border border-warn/40 bg-warn-soft px-3 py-2 text-xs text-ink-soft ${className}`}
    >
      <b className="font-semibold text-warn">Chemical safety.</b> Handle compounds and solvents according to their
      safety data sheets and your institution&rsquo;s chemical-hygiene rules.
    </div>
  );
}
