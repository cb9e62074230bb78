"use client";
import { useActionState } from "react";
import type { ActionState } from "@/server/action";

export function DigestToggle({
  action,
  campaignId,
  receiving,
}: {
  action: (p: ActionState, f: FormData) => Promise<ActionState>;
  campaignId: string;
  receiving: boolean;
}) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="flex items-center gap-2">
      <input type="hidden" name="campaignId" value={campaignId} />
      <input type="hidden" name="receive" value={receiving ? "0" : "1"} />
      <span className={`chip ${receiving ? "bg-pass-soft text-pass" : "bg-paper-sunk text-ink-muted"}`}>
        {receiving ? "receiving" : "stopped"}
      </span>
      <button className="btn-quiet px-2 py-0.5 text-xs" disabled={pending}>
        {receiving ? "Stop" : "Receive again"}
      </button>
      {state && !state.ok ? <span className="text-xs text-fail">{state.error}</span> : null}
    </form>
  );
}
