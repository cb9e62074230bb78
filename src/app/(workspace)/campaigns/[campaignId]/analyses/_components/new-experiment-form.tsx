"use client";
import { useActionState, useState } from "react";
import type { ActionState } from "@/server/action";
import { FieldError, FormMessage } from "@/components/forms/form-bits";

type Run = { id: string; label: string; map: string; readout: string; decision: string; zPrime: number | null };
type Action = (prev: ActionState, form: FormData) => Promise<ActionState>;

export function NewExperimentForm({
  action,
  campaignId,
  runs,
  defaultThresholdPct,
}: {
  action: Action;
  campaignId: string;
  runs: Run[];
  defaultThresholdPct: number;
}) {
  const [state, formAction, pending] = useActionState(action, null);
  const [kind, setKind] = useState<"single-dose" | "dose-response" | "mechanism">("single-dose");
  const [rule, setRule] = useState("threshold");
  const [filter, setFilter] = useState("");
  const shown = runs.filter((r) =>
    filter ? `${r.label} ${r.map}`.toLowerCase().includes(filter.toLowerCase()) : true,
  );
  return (
    <form action={formAction} className="card flex flex-col gap-3 p-4" noValidate>
      <FormMessage state={state} />
      <input type="hidden" name="campaignId" value={campaignId} />
      <div className="flex flex-wrap gap-3">
        <label className="w-72">
          <span className="field-label">Name</span>
          <input className="input" name="name" placeholder="e.g. Primary screen, week 48" />
          <FieldError state={state} name="name" />
        </label>
        <label>
          <span className="field-label">Kind</span>
          <select className="input" name="kind" value={kind} onChange={(e) => setKind(e.target.value as typeof kind)}>
            <option value="single-dose">Single-dose screen</option>
            <option value="dose-response">Dose-response</option>
            <option value="mechanism">Mechanism study</option>
          </select>
        </label>
        {kind === "single-dose" ? (
          <>
            <label>
              <span className="field-label">Hit rule</span>
              <select className="input" name="hitRule" value={rule} onChange={(e) => setRule(e.target.value)}>
                <option value="threshold">% inhibition threshold</option>
                <option value="sd">mean + k·SD of neutral controls</option>
                <option value="robust">median + k·1.4826·MAD of neutral controls</option>
              </select>
            </label>
            {rule === "threshold" ? (
              <label>
                <span className="field-label">Threshold (% inhibition)</span>
                <input className="input num w-28" name="hitThresholdPct" defaultValue={defaultThresholdPct} />
              </label>
            ) : (
              <label>
                <span className="field-label">k (SDs)</span>
                <input className="input num w-20" name="hitK" defaultValue={3} />
              </label>
            )}
          </>
        ) : null}
        {kind === "dose-response" ? (
          <>
            <label>
              <span className="field-label">Assay [S] for Cheng–Prusoff (µM)</span>
              <input className="input num w-32" name="substrateUm" inputMode="decimal" />
            </label>
            <label>
              <span className="field-label">Fix top (% inhibition)</span>
              <input className="input num w-24" name="fixTopPct" placeholder="free" />
            </label>
            <label>
              <span className="field-label">Fix bottom (% inhibition)</span>
              <input className="input num w-24" name="fixBottomPct" placeholder="free" />
            </label>
          </>
        ) : null}
        {kind !== "single-dose" ? (
          <>
            <label>
              <span className="field-label">Weighting</span>
              <select className="input" name="weighting" defaultValue="auto">
                <option value="auto">auto: relative when replicate SD grows with the signal</option>
                <option value="none">none (ordinary least squares)</option>
                <option value="relative">relative (1/Ŷ², SD ∝ signal)</option>
              </select>
            </label>
            <label className="flex items-center gap-2 self-end pb-1.5 text-sm">
              <input type="checkbox" name="robust" value="on" />
              Report the fit without proposed outliers (robust, ROUT Q = 1 %)
            </label>
          </>
        ) : null}
      </div>
      <div>
        <div className="mb-1 flex items-end justify-between">
          <span className="field-label">Plate runs ({runs.length})</span>
          <input
            className="input w-56 py-1 text-xs"
            placeholder="Filter runs"
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
          />
        </div>
        <FieldError state={state} name="runIds" />
        <div className="max-h-64 overflow-auto rounded border border-rule">
          <table className="table-dense">
            <thead className="sticky top-0 bg-paper-raised">
              <tr>
                <th className="w-8"></th>
                <th>Run</th>
                <th>Plate map</th>
                <th>Readout</th>
                <th className="text-right">Z′</th>
                <th>Decision</th>
              </tr>
            </thead>
            <tbody>
              {shown.map((r) => (
                <tr key={r.id} className={r.decision === "accepted" ? "" : "text-ink-muted"}>
                  <td>
                    <input
                      type="checkbox"
                      name="runIds"
                      value={r.id}
                      defaultChecked={false}
                      aria-label={`Include ${r.label}`}
                    />
                  </td>
                  <td>{r.label}</td>
                  <td>{r.map}</td>
                  <td>{r.readout}</td>
                  <td className="num text-right">{r.zPrime === null ? "—" : r.zPrime.toFixed(2)}</td>
                  <td>
                    {r.decision === "accepted"
                      ? "accepted"
                      : r.decision === "rejected"
                        ? "rejected (not used)"
                        : "awaiting review (not used until accepted)"}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </div>
      <button className="btn-primary self-start" disabled={pending}>
        Create experiment
      </button>
    </form>
  );
}
