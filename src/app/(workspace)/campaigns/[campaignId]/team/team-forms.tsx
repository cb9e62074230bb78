"use client";
import { useActionState } from "react";
import type { ActionState } from "@/server/action";
import { FieldError, FormMessage } from "@/components/forms/form-bits";
import { campaignRoles, roleLabels, type CampaignRole } from "@/lib/roles";

type Action = (prev: ActionState, form: FormData) => Promise<ActionState>;

export function TeamForms({ campaignId, invite }: { campaignId: string; invite: Action }) {
  const [state, action, pending] = useActionState(invite, null);
  return (
    <form action={action} className="mt-3 flex flex-wrap items-end gap-2" noValidate>
      <input type="hidden" name="campaignId" value={campaignId} />
      <label className="w-72">
        <span className="field-label">Invite by e-mail</span>
        <input className="input" name="email" type="email" placeholder="name@institute.org" />
        <FieldError state={state} name="email" />
      </label>
      <label>
        <span className="field-label">Role</span>
        <select className="input" name="role" defaultValue="viewer">
          {campaignRoles.map((r) => (
            <option key={r} value={r}>
              {roleLabels[r]}
            </option>
          ))}
        </select>
      </label>
      <button className="btn-primary" type="submit" disabled={pending}>
        Send invitation
      </button>
      <div className="w-full">
        <FormMessage state={state} />
      </div>
    </form>
  );
}

export function MemberRow({
  campaignId,
  userId,
  role,
  changeRole,
  remove,
}: {
  campaignId: string;
  userId: string;
  role: CampaignRole;
  changeRole: Action;
  remove: Action;
}) {
  const [s1, a1, p1] = useActionState(changeRole, null);
  const [s2, a2, p2] = useActionState(remove, null);
  return (
    <div className="flex flex-col gap-1">
      <div className="flex items-center gap-1">
        <form action={a1} className="flex items-center gap-1">
          <input type="hidden" name="campaignId" value={campaignId} />
          <input type="hidden" name="userId" value={userId} />
          <select className="input py-0.5 text-xs" name="role" defaultValue={role} aria-label="Role">
            {campaignRoles.map((r) => (
              <option key={r} value={r}>
                {roleLabels[r]}
              </option>
            ))}
          </select>
          <button className="btn-quiet px-2 py-0.5 text-xs" disabled={p1}>
            Save
          </button>
        </form>
        <form action={a2}>
          <input type="hidden" name="campaignId" value={campaignId} />
          <input type="hidden" name="userId" value={userId} />
          <button className="btn-danger px-2 py-0.5 text-xs" disabled={p2}>
            Remove
          </button>
        </form>
      </div>
      <FormMessage state={s1 ?? s2} />
    </div>
  );
}

export function ThresholdsForm({
  campaignId,
  editable,
  values,
  action,
}: {
  campaignId: string;
  editable: boolean;
  values: { qcMinZPrime: number; qcMaxCvPct: number; hitThresholdPct: number };
  action: Action;
}) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="card flex flex-wrap items-end gap-3 p-3" noValidate>
      <input type="hidden" name="campaignId" value={campaignId} />
      <label>
        <span className="field-label">Minimum Z′ (dimensionless)</span>
        <input className="input num w-32" name="qcMinZPrime" defaultValue={values.qcMinZPrime} disabled={!editable} />
        <FieldError state={state} name="qcMinZPrime" />
      </label>
      <label>
        <span className="field-label">Maximum control CV (%)</span>
        <input className="input num w-32" name="qcMaxCvPct" defaultValue={values.qcMaxCvPct} disabled={!editable} />
        <FieldError state={state} name="qcMaxCvPct" />
      </label>
      <label>
        <span className="field-label">Hit threshold (% inhibition)</span>
        <input
          className="input num w-32"
          name="hitThresholdPct"
          defaultValue={values.hitThresholdPct}
          disabled={!editable}
        />
        <FieldError state={state} name="hitThresholdPct" />
      </label>
      {editable ? (
        <button className="btn-primary" disabled={pending}>
          Save thresholds
        </button>
      ) : (
        <p className="text-xs text-ink-muted">Only the project lead or an administrator changes thresholds.</p>
      )}
      <div className="w-full">
        <FormMessage state={state} />
      </div>
    </form>
  );
}
