"use client";
import { useActionState } from "react";
import type { ActionState } from "@/server/action";
import { FieldError, FormMessage } from "@/components/forms/form-bits";

type Action = (prev: ActionState, form: FormData) => Promise<ActionState>;

export function OverrideForm({
  action,
  campaignId,
  experimentId,
  compoundId,
  current,
}: {
  action: Action;
  campaignId: string;
  experimentId: string;
  compoundId: string;
  current: string;
}) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="card flex flex-wrap items-end gap-3 p-3" noValidate>
      <input type="hidden" name="campaignId" value={campaignId} />
      <input type="hidden" name="experimentId" value={experimentId} />
      <input type="hidden" name="compoundId" value={compoundId} />
      <label>
        <span className="field-label">Mechanism</span>
        <select className="input" name="model" defaultValue={current}>
          <option value="competitive">competitive</option>
          <option value="uncompetitive">uncompetitive</option>
          <option value="noncompetitive">noncompetitive</option>
          <option value="mixed">mixed</option>
        </select>
      </label>
      <label className="min-w-80 flex-1">
        <span className="field-label">Reason (recorded in the audit log)</span>
        <input className="input" name="reason" placeholder="e.g. orthogonal binding assay shows active-site binding" />
        <FieldError state={state} name="reason" />
      </label>
      <button className="btn-quiet" disabled={pending}>
        Record override
      </button>
      <div className="w-full">
        <FormMessage state={state} />
      </div>
    </form>
  );
}

export function PlannerForm({
  action,
  campaignId,
  compoundId,
  ic50Um,
  kmUm,
  assaySubstrateUm,
}: {
  action: Action;
  campaignId: string;
  compoundId: string;
  ic50Um: number;
  kmUm: number | null;
  assaySubstrateUm: number | null;
}) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="card flex flex-wrap items-end gap-3 p-3" noValidate>
      <input type="hidden" name="campaignId" value={campaignId} />
      <input type="hidden" name="compoundId" value={compoundId} />
      <label>
        <span className="field-label">IC50 (µM)</span>
        <input className="input num w-28" name="ic50Um" defaultValue={Number(ic50Um.toPrecision(3))} />
      </label>
      <label>
        <span className="field-label">Km (µM)</span>
        <input className="input num w-28" name="kmUm" defaultValue={kmUm ?? ""} placeholder="campaign Km" />
      </label>
      <label>
        <span className="field-label">[S] of the IC50 assay (µM)</span>
        <input className="input num w-28" name="assaySubstrateUm" defaultValue={assaySubstrateUm ?? ""} />
      </label>
      <label>
        <span className="field-label">Plate</span>
        <select className="input" name="format" defaultValue="384">
          <option value="96">96-well</option>
          <option value="384">384-well</option>
          <option value="1536">1536-well</option>
        </select>
      </label>
      <label className="w-64">
        <span className="field-label">Plate map name</span>
        <input className="input" name="name" defaultValue={`MoA ${compoundId}`} />
      </label>
      <button className="btn-primary" disabled={pending}>
        Create the plate map
      </button>
      <p className="w-full text-xs text-ink-muted">
        Substrate at 8 concentrations over 0.2–10 × Km; inhibitor 0 and 0.3–10 × the expected Ki (IC50/(1 + [S]/Km));
        duplicates; neutral and full-inhibition controls in columns 1–2. The map opens in the editor for changes. Handle
        compounds and solvents according to their safety data sheets.
      </p>
      <div className="w-full">
        <FormMessage state={state} />
      </div>
    </form>
  );
}
