import type { RunQc } from "@/lib/plates/run-qc";
import { fmtNum, fmtSig } from "./status";

function Row({
  label,
  value,
  unit,
  note,
  bad,
}: {
  label: React.ReactNode;
  value: string;
  unit?: string;
  note?: string;
  bad?: boolean;
}) {
  return (
    <tr>
      <td className="text-ink-soft">
        {label}
        {note ? <span className="block text-2xs text-ink-faint">{note}</span> : null}
      </td>
      <td className={`num text-right ${bad ? "font-semibold text-fail" : ""}`}>{value}</td>
      <td className="text-2xs text-ink-muted">{unit ?? ""}</td>
    </tr>
  );
}

/** Every QC figure of a run with its unit, the thresholds it was judged against, and why. */
export function QcPanel({ qc }: { qc: RunQc }) {
  const t = qc.thresholds;
  const u = qc.signalUnit;
  const cvBad = (f: RunQc["neutral"]) => !!f && f.cvApplies && (f.cvPct === null || f.cvPct > t.maxCvPct);
  return (
    <section className="card px-3 py-2" aria-label="Quality control">
      <div className="mb-1 flex items-baseline justify-between">
        <h3>Quality control</h3>
        <span className={`chip ${qc.verdict === "pass" ? "bg-pass-soft text-pass" : "bg-fail-soft text-fail"}`}>
          {qc.verdict === "pass" ? "pass" : "fail"}
        </span>
      </div>
      <table className="table-dense">
        <tbody>
          <Row
            label="Z′-factor"
            value={fmtNum(qc.zPrime, 3)}
            unit="dimensionless"
            note={`minimum ${t.minZPrime}`}
            bad={qc.zPrime === null || qc.zPrime < t.minZPrime}
          />
          <Row label="Robust Z′ (median, MAD)" value={fmtNum(qc.robustZPrime, 3)} unit="dimensionless" />
          <Row label="Signal / background (S/B)" value={fmtNum(qc.signalToBackground, 2)} unit="ratio" />
          <Row label="Signal window (SW)" value={fmtNum(qc.signalWindow, 2)} unit="SD units" />
          <Row
            label="CV neutral controls"
            value={fmtNum(qc.cvNeutralPct, 1)}
            unit="%"
            note={qc.neutral?.cvApplies === false ? "mean near zero: limit not applied" : `maximum ${t.maxCvPct} %`}
            bad={cvBad(qc.neutral)}
          />
          <Row
            label="CV full-inhibition controls"
            value={fmtNum(qc.cvFullPct, 1)}
            unit="%"
            note={qc.full?.cvApplies === false ? "mean near zero: limit not applied" : `maximum ${t.maxCvPct} %`}
            bad={cvBad(qc.full)}
          />
          <Row label={`Neutral mean (n = ${qc.neutral?.n ?? 0})`} value={fmtSig(qc.neutral?.mean)} unit={u} />
          <Row label={`Full-inhibition mean (n = ${qc.full?.n ?? 0})`} value={fmtSig(qc.full?.mean)} unit={u} />
          <Row
            label="Signal with inhibition"
            value={qc.direction.observed ?? "—"}
            unit={`map: ${qc.direction.expected}`}
            bad={!qc.direction.ok}
          />
          {qc.edge ? (
            <Row
              label={`Edge vs inner (${qc.edge.basis} wells, median)`}
              value={`${qc.edge.differencePct >= 0 ? "+" : ""}${fmtNum(qc.edge.differencePct, 1)}`}
              unit="%"
              note={`${qc.edge.outerWells} outer, ${qc.edge.innerWells} inner; flagged beyond ±10 %`}
              bad={qc.edge.flagged}
            />
          ) : null}
          <Row label="Masked wells" value={String(qc.maskedWells)} unit="wells" />
          {qc.readout === "kinetic" ? (
            <Row label="Curved progress curves" value={String(qc.nonLinearWells)} unit="wells" />
          ) : null}
        </tbody>
      </table>
      {qc.reasons.length > 0 ? (
        <ul className="mt-2 list-disc pl-4 text-xs text-fail">
          {qc.reasons.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      ) : null}
      {qc.warnings.length > 0 ? (
        <ul className="mt-2 list-disc pl-4 text-xs text-warn">
          {qc.warnings.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      ) : null}
      <p className="mt-2 text-2xs text-ink-faint">
        Z′ = 1 − 3(σneutral + σfull)/|μneutral − μfull| (Zhang, Chung &amp; Oldenburg 1999), unmasked controls only. %
        inhibition = 100·(μneutral − x)/(μneutral − μfull) against this run&rsquo;s own controls.
      </p>
    </section>
  );
}
