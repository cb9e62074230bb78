"use client";
import { useRouter } from "next/navigation";
import { useActionState, useState } from "react";
import { decideRunAction } from "../actions";
import { FormMessage } from "@/components/forms/form-bits";
import { apiPaths } from "@/hooks/api-paths";
import { fetchJson } from "@/hooks/fetcher";

/** "Accept all that pass": one reason for every undecided run of the batch whose QC passes. */
export function AcceptPassingForm({
  campaignId,
  batchId,
  eligible,
}: {
  campaignId: string;
  batchId: string;
  eligible: number;
}) {
  const router = useRouter();
  const [reason, setReason] = useState("");
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    try {
      const r = await fetchJson<{ accepted: string[]; failing: number; alreadyDecided: number }>(
        apiPaths.plateBatchAcceptPassing(campaignId, batchId),
        { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ reason }) },
      );
      setMsg({
        ok: true,
        text: `${r.accepted.length} run${r.accepted.length === 1 ? "" : "s"} accepted; ${r.failing} failing QC left for review; ${r.alreadyDecided} decided before.`,
      });
      router.refresh();
    } catch (err) {
      setMsg({ ok: false, text: err instanceof Error ? err.message : "Not accepted." });
    } finally {
      setBusy(false);
    }
  }
  return (
    <form onSubmit={submit} className="flex flex-wrap items-end gap-2">
      <label className="flex min-w-[22rem] flex-1 flex-col gap-1 text-sm">
        <span className="field-label">Reason for accepting the {eligible} undecided passing runs</span>
        <input
          className="input"
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          required
          minLength={3}
          maxLength={500}
          placeholder="e.g. controls and Z′ within limits on every plate; no edge effect"
        />
      </label>
      <button className="btn-primary" disabled={busy || eligible === 0 || reason.trim().length < 3}>
        Accept all that pass
      </button>
      {msg ? (
        <p role={msg.ok ? "status" : "alert"} className={`w-full text-sm ${msg.ok ? "text-pass" : "text-fail"}`}>
          {msg.text}
        </p>
      ) : null}
    </form>
  );
}

/** Per-plate accept/reject with a reason, through the run's ordinary decision. */
export function RowDecision({
  campaignId,
  runId,
  canAccept,
}: {
  campaignId: string;
  runId: string;
  canAccept: boolean;
}) {
  const [state, action, pending] = useActionState(decideRunAction, null);
  return (
    <form action={action} className="flex items-center gap-1">
      <input type="hidden" name="campaignId" value={campaignId} />
      <input type="hidden" name="runId" value={runId} />
      <input
        name="reason"
        required
        minLength={3}
        maxLength={500}
        className="input w-36 py-0.5 text-2xs"
        placeholder="reason"
        aria-label="Reason for this plate's decision"
      />
      <button
        className="btn-quiet px-1.5 py-0.5 text-2xs"
        name="decision"
        value="accepted"
        disabled={pending || !canAccept}
        title={canAccept ? "Accept this plate" : "A plate that fails QC cannot be accepted."}
      >
        Accept
      </button>
      <button
        className="btn-quiet px-1.5 py-0.5 text-2xs text-fail"
        name="decision"
        value="rejected"
        disabled={pending}
      >
        Reject
      </button>
      {state && !state.ok ? <FormMessage state={state} /> : null}
    </form>
  );
}

/** Pick the plate map of an unmatched (or refused) file; it is then uploaded like any other. */
export function AssignMap({
  campaignId,
  batchId,
  fileId,
  maps,
}: {
  campaignId: string;
  batchId: string;
  fileId: string;
  maps: { id: string; name: string }[];
}) {
  const router = useRouter();
  const [mapId, setMapId] = useState(maps[0]?.id ?? "");
  const [err, setErr] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function assign() {
    setBusy(true);
    try {
      await fetchJson(apiPaths.plateBatchAssign(campaignId, batchId, fileId), {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ plateMapId: mapId }),
      });
      router.refresh();
    } catch (e) {
      setErr(e instanceof Error ? e.message : "Not assigned.");
    } finally {
      setBusy(false);
    }
  }
  return (
    <div className="flex items-center gap-1">
      <select
        className="input py-0.5 text-2xs"
        value={mapId}
        onChange={(e) => {
          setMapId(e.target.value);
          setErr(null);
        }}
        aria-label="Plate map for this file"
      >
        {maps.map((m) => (
          <option key={m.id} value={m.id}>
            {m.name}
          </option>
        ))}
      </select>
      <button className="btn-quiet px-1.5 py-0.5 text-2xs" disabled={busy || !mapId} onClick={assign}>
        Assign and upload
      </button>
      {err ? <span className="text-2xs text-fail">{err}</span> : null}
    </div>
  );
}
