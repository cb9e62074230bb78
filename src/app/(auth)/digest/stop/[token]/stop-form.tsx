"use client";
import { useActionState } from "react";
import type { ActionState } from "@/server/action";
import { FormMessage } from "@/components/forms/form-bits";

export function StopDigestForm({
  action,
  token,
}: {
  action: (p: ActionState, f: FormData) => Promise<ActionState>;
  token: string;
}) {
  const [state, formAction, pending] = useActionState(action, null);
  if (state?.ok) return <FormMessage state={state} />;
  return (
    <form action={formAction} className="flex flex-col gap-2">
      <input type="hidden" name="token" value={token} />
      <FormMessage state={state} />
      <button className="btn-primary" disabled={pending}>
        Stop sending it to me
      </button>
    </form>
  );
}
