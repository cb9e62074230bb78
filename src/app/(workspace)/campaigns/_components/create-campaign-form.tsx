"use client";
import { useActionState } from "react";
import type { ActionState } from "@/server/action";
import { FieldError, FormMessage } from "@/components/forms/form-bits";

type Action = (prev: ActionState, form: FormData) => Promise<ActionState>;

export function CreateCampaignForm({ action }: { action: Action }) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="card grid max-w-3xl grid-cols-2 gap-3 p-4" noValidate>
      <div className="col-span-2">
        <FormMessage state={state} />
      </div>
      <label>
        <span className="field-label">Name</span>
        <input className="input" name="name" required />
        <FieldError state={state} name="name" />
      </label>
      <label>
        <span className="field-label">Target enzyme</span>
        <input className="input" name="targetEnzyme" required />
        <FieldError state={state} name="targetEnzyme" />
      </label>
      <label>
        <span className="field-label">Substrate</span>
        <input className="input" name="substrate" />
      </label>
      <div className="flex gap-2">
        <label className="flex-1">
          <span className="field-label">Km (if known)</span>
          <input className="input num" name="kmValue" inputMode="decimal" />
          <FieldError state={state} name="kmValue" />
        </label>
        <label className="w-24">
          <span className="field-label">unit</span>
          <select className="input" name="kmUnit" defaultValue="µM">
            <option>nM</option>
            <option>µM</option>
            <option>mM</option>
          </select>
        </label>
      </div>
      <div className="flex gap-2">
        <label className="flex-1">
          <span className="field-label">Enzyme concentration in the assay (if known)</span>
          <input className="input num" name="enzymeConcValue" inputMode="decimal" />
          <FieldError state={state} name="enzymeConcValue" />
        </label>
        <label className="w-24">
          <span className="field-label">unit</span>
          <select className="input" name="enzymeConcUnit" defaultValue="nM">
            <option>pM</option>
            <option>nM</option>
            <option>µM</option>
          </select>
        </label>
      </div>
      <div className="flex gap-2">
        <label className="flex-1">
          <span className="field-label">QC: minimum Z′</span>
          <input className="input num" name="qcMinZPrime" defaultValue="0.5" inputMode="decimal" />
          <FieldError state={state} name="qcMinZPrime" />
        </label>
        <label className="flex-1">
          <span className="field-label">QC: maximum control CV (%)</span>
          <input className="input num" name="qcMaxCvPct" defaultValue="20" inputMode="decimal" />
          <FieldError state={state} name="qcMaxCvPct" />
        </label>
      </div>
      <label className="col-span-2">
        <span className="field-label">Assay notes</span>
        <textarea className="input" name="assayNotes" rows={3} />
      </label>
      <label>
        <span className="field-label">Time zone (for the weekly digest)</span>
        <input className="input" name="timeZone" defaultValue="UTC" />
      </label>
      <div className="col-span-2">
        <button className="btn-primary" type="submit" disabled={pending}>
          Create campaign
        </button>
      </div>
    </form>
  );
}
