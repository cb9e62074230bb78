"use client";
import type { ActionState } from "@/server/action";

export function FormMessage({ state }: { state: ActionState }) {
  if (!state) return null;
  if (state.ok)
    return state.message ? (
      <p role="status" className="rounded bg-pass-soft px-2 py-1.5 text-sm text-pass">
        {state.message}
      </p>
    ) : null;
  return (
    <p role="alert" className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">
      {state.error}
    </p>
  );
}

export function FieldError({ state, name }: { state: ActionState; name: string }) {
  const msg = state && !state.ok ? state.fieldErrors?.[name] : undefined;
  return msg ? <p className="mt-1 text-xs text-fail">{msg}</p> : null;
}
