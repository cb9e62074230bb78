"use client";
import { useActionState } from "react";
import { decideRunAction } from "../actions";
import { FormMessage } from "@/components/forms/form-bits";

/** Accept or reject the run with a reason; accepting is offered only when QC passes. */
export function DecisionForm({
  campaignId,
  runId,
  canAccept,
  current,
}: {
  campaignId: string;
  runId: string;
  canAccept: boolean;
  current: string;
}) {
  const [state, action, pending] = useActionState(decideRunAction, null);
  return (
    <form action={action} className="mt-2 flex flex-col gap-2">
      <input type="hidden" name="campaignId" value={campaignId} />
      <input type="hidden" name="runId" value={runId} />
      <label className="field-label" htmlFor="decision-reason">
        Reason {current !== "pending" ? "(changes the decision)" : ""}
      </label>
      <textarea
        id="decision-reason"
        name="reason"
        required
        minLength={3}
        maxLength={500}
        rows={2}
        className="input"
        placeholder="e.g. controls and Z′ within limits; no edge effect"
      />
      <div className="flex gap-2">
        <button
          className="btn-primary"
          name="decision"
          value="accepted"
          disabled={pending || !canAccept}
          title={canAccept ? undefined : "A run that fails QC cannot be accepted."}
        >
          Accept run
        </button>
        <button className="btn-danger" name="decision" value="rejected" disabled={pending}>
          Reject run
        </button>
      </div>
      {!canAccept ? (
        <p className="text-2xs text-ink-muted">
          This run fails QC, so it cannot be accepted. Mask the wells at fault with a reason, or reject it.
        </p>
      ) : null}
      <FormMessage state={state} />
    </form>
  );
}
