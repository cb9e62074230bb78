"use client";
import { useActionState } from "react";
import { FieldError, FormMessage } from "@/components/forms/form-bits";
import type { ActionState } from "@/server/action";
import { AMOUNT_UNITS } from "@/lib/chem/validation";
import { addBatchAction, addStockAction, editCompoundAction } from "../actions";

function Field({ label, name, children }: { label: string; name: string; children: React.ReactNode }) {
  return (
    <label className="text-xs text-ink-muted" htmlFor={name}>
      {label}
      {children}
    </label>
  );
}

export function StockFields({ prefix = "stock." }: { prefix?: string }) {
  return (
    <>
      <Field label="Stock concentration (mM)" name={`${prefix}concentrationMm`}>
        <input
          className="input mt-1 num"
          id={`${prefix}concentrationMm`}
          name={`${prefix}concentrationMm`}
          inputMode="decimal"
          placeholder="e.g. 10"
        />
      </Field>
      <Field label="Solvent" name={`${prefix}solvent`}>
        <input className="input mt-1" id={`${prefix}solvent`} name={`${prefix}solvent`} placeholder="e.g. DMSO" />
      </Field>
      <Field label="Volume (µL)" name={`${prefix}volumeUl`}>
        <input className="input mt-1 num" id={`${prefix}volumeUl`} name={`${prefix}volumeUl`} inputMode="decimal" />
      </Field>
      <Field label="Location" name={`${prefix}location`}>
        <input
          className="input mt-1"
          id={`${prefix}location`}
          name={`${prefix}location`}
          placeholder="Freezer 2 / Rack B / A07"
        />
      </Field>
      <Field label="Made on" name={`${prefix}date`}>
        <input className="input mt-1" type="date" id={`${prefix}date`} name={`${prefix}date`} />
      </Field>
    </>
  );
}

export function BatchFields() {
  return (
    <>
      <Field label="Supplier" name="batch.supplier">
        <input className="input mt-1" id="batch.supplier" name="batch.supplier" />
      </Field>
      <Field label="Purity (%)" name="batch.purityPct">
        <input className="input mt-1 num" id="batch.purityPct" name="batch.purityPct" inputMode="decimal" />
      </Field>
      <Field label="Amount" name="batch.amount">
        <span className="mt-1 flex gap-1">
          <input className="input num" id="batch.amount" name="batch.amount" inputMode="decimal" />
          <select className="input w-20" name="batch.amountUnit" aria-label="Amount unit" defaultValue="mg">
            {AMOUNT_UNITS.map((u) => (
              <option key={u}>{u}</option>
            ))}
          </select>
        </span>
      </Field>
      <Field label="Salt / solvate form" name="batch.saltForm">
        <input className="input mt-1" id="batch.saltForm" name="batch.saltForm" placeholder="HCl, TFA salt, hydrate" />
      </Field>
      <Field label="Date received or made" name="batch.date">
        <input className="input mt-1" type="date" id="batch.date" name="batch.date" />
      </Field>
    </>
  );
}

function fieldErrorList(state: ActionState) {
  if (!state || state.ok || !state.fieldErrors) return null;
  return (
    <ul className="text-xs text-fail">
      {Object.entries(state.fieldErrors).map(([k, v]) => (
        <li key={k}>
          {k}: {v}
        </li>
      ))}
    </ul>
  );
}

export function AddBatchForm({ registryId }: { registryId: string }) {
  const [state, action, pending] = useActionState(addBatchAction, null);
  return (
    <details className="mt-3" id="add-batch">
      <summary className="cursor-pointer text-sm text-accent">Add a batch</summary>
      <form action={action} className="mt-2 flex flex-col gap-2">
        <input type="hidden" name="registryId" value={registryId} />
        <div className="grid grid-cols-2 gap-2 md:grid-cols-5">
          <BatchFields />
        </div>
        <p className="text-xs text-ink-muted">Optional: a stock solution made from this batch.</p>
        <div className="grid grid-cols-2 gap-2 md:grid-cols-5">
          <StockFields />
        </div>
        {fieldErrorList(state)}
        <FormMessage state={state} />
        <div>
          <button className="btn-primary" disabled={pending}>
            {pending ? "Adding…" : "Add batch"}
          </button>
        </div>
      </form>
    </details>
  );
}

export function AddStockForm({ registryId, batches }: { registryId: string; batches: number[] }) {
  const [state, action, pending] = useActionState(addStockAction, null);
  return (
    <details className="mt-3">
      <summary className="cursor-pointer text-sm text-accent">Record a stock solution</summary>
      <form action={action} className="mt-2 flex flex-col gap-2">
        <input type="hidden" name="registryId" value={registryId} />
        <div className="grid grid-cols-2 gap-2 md:grid-cols-6">
          <Field label="From batch" name="batchNumber">
            <select className="input mt-1" id="batchNumber" name="batchNumber" defaultValue={batches.at(-1)}>
              {batches.map((b) => (
                <option key={b} value={b}>
                  {String(b).padStart(2, "0")}
                </option>
              ))}
            </select>
          </Field>
          <StockFields />
        </div>
        {fieldErrorList(state)}
        <FormMessage state={state} />
        <div>
          <button className="btn-primary" disabled={pending}>
            {pending ? "Saving…" : "Record stock solution"}
          </button>
        </div>
      </form>
    </details>
  );
}

export function EditNamesForm({ registryId, name, aliases }: { registryId: string; name: string; aliases: string }) {
  const [state, action, pending] = useActionState(editCompoundAction, null);
  return (
    <form action={action} className="flex flex-col gap-2">
      <input type="hidden" name="registryId" value={registryId} />
      <Field label="Name" name="name">
        <input className="input mt-1" id="name" name="name" defaultValue={name} />
      </Field>
      <Field label="Aliases / supplier codes (separate with ;)" name="aliases">
        <input className="input mt-1" id="aliases" name="aliases" defaultValue={aliases} />
      </Field>
      <FieldError state={state} name="name" />
      <FieldError state={state} name="aliases" />
      <FormMessage state={state} />
      <div>
        <button className="btn-quiet" disabled={pending}>
          Save names
        </button>
      </div>
    </form>
  );
}

export function EditStructureForm({ registryId, smiles }: { registryId: string; smiles: string }) {
  const [state, action, pending] = useActionState(editCompoundAction, null);
  return (
    <form action={action} className="flex flex-col gap-2">
      <input type="hidden" name="registryId" value={registryId} />
      <Field label="Corrected structure (SMILES)" name="smiles">
        <input className="input mt-1 font-mono" id="smiles" name="smiles" defaultValue={smiles} spellCheck={false} />
      </Field>
      <Field label="Reason (recorded in the audit log)" name="reason">
        <input className="input mt-1" id="reason" name="reason" required minLength={3} />
      </Field>
      <FieldError state={state} name="smiles" />
      <FormMessage state={state} />
      <div>
        <button className="btn-danger" disabled={pending}>
          Change structure
        </button>
      </div>
    </form>
  );
}
