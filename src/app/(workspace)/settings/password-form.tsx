"use client";
import { useActionState } from "react";
import type { ActionState } from "@/server/action";
import { FieldError, FormMessage } from "@/components/forms/form-bits";

export function PasswordForm({ action }: { action: (p: ActionState, f: FormData) => Promise<ActionState> }) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="card flex max-w-md flex-col gap-3 p-4" noValidate>
      <FormMessage state={state} />
      <label>
        <span className="field-label">Current password</span>
        <input className="input" type="password" name="current" autoComplete="current-password" />
        <FieldError state={state} name="current" />
      </label>
      <label>
        <span className="field-label">New password (at least 10 characters)</span>
        <input className="input" type="password" name="password" autoComplete="new-password" />
        <FieldError state={state} name="password" />
      </label>
      <p className="text-xs text-ink-muted">Saving signs you out on every other device.</p>
      <button className="btn-primary self-start" disabled={pending}>
        Change password
      </button>
    </form>
  );
}
