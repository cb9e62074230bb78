"use client";
import { useActionState } from "react";
import type { ActionState } from "@/server/action";
import { FieldError, FormMessage } from "@/components/forms/form-bits";

type Action = (prev: ActionState, form: FormData) => Promise<ActionState>;

export function DigestControls({ campaignId, action }: { campaignId: string; action: Action }) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="card flex flex-col gap-2 p-3">
      <input type="hidden" name="campaignId" value={campaignId} />
      <p className="text-sm">Send this week&rsquo;s digest now. Members who already had it this week are skipped.</p>
      <button className="btn-primary self-start" disabled={pending}>
        {pending ? "Sending…" : "Send now"}
      </button>
      <FormMessage state={state} />
    </form>
  );
}

const days = ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"];

export function ScheduleForm({
  campaignId,
  action,
  values,
}: {
  campaignId: string;
  action: Action;
  values: { digestWeekday: number; digestHour: number; timeZone: string };
}) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className="card flex flex-wrap items-end gap-2 p-3" noValidate>
      <input type="hidden" name="campaignId" value={campaignId} />
      <label>
        <span className="field-label">Day</span>
        <select className="input" name="digestWeekday" defaultValue={values.digestWeekday}>
          {days.map((d, k) => (
            <option key={d} value={k + 1}>
              {d}
            </option>
          ))}
        </select>
      </label>
      <label>
        <span className="field-label">Hour (0–23, local)</span>
        <input className="input num w-20" name="digestHour" defaultValue={values.digestHour} />
        <FieldError state={state} name="digestHour" />
      </label>
      <label>
        <span className="field-label">Time zone</span>
        <input className="input w-44" name="timeZone" defaultValue={values.timeZone} />
        <FieldError state={state} name="timeZone" />
      </label>
      <button className="btn-quiet" disabled={pending}>
        Save schedule
      </button>
      <div className="w-full">
        <FormMessage state={state} />
      </div>
    </form>
  );
}
