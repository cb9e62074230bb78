"use client";
import { useActionState, useEffect, useRef } from "react";
import { useRouter } from "next/navigation";
import type { ActionState } from "@/server/action";
import { useAnalysisProgress } from "@/hooks/use-analyses";
import { FormMessage } from "@/components/forms/form-bits";

type Latest = {
  id: string;
  status: "queued" | "running" | "done" | "failed";
  progress: number;
  error: string | null;
} | null;
type Started = { analysisId: string; status: string };
type Action = (prev: ActionState<Started>, form: FormData) => Promise<ActionState<Started>>;

/**
 * Starts an analysis and follows its progress from the server (the job runs in the worker, so
 * leaving the page and coming back shows the same progress).
 */
export function AnalysisRunner({
  action,
  campaignId,
  experimentId,
  mayRun,
  latest,
  upToDate,
}: {
  action: Action;
  campaignId: string;
  experimentId: string;
  mayRun: boolean;
  latest: Latest;
  upToDate: boolean;
}) {
  const router = useRouter();
  const [state, formAction, pending] = useActionState(action, null);
  const started = state && state.ok ? state.data?.analysisId : undefined;
  const followId =
    started ?? (latest && (latest.status === "queued" || latest.status === "running") ? latest.id : undefined);
  const { data } = useAnalysisProgress(campaignId, experimentId, followId);
  const refreshed = useRef<string | null>(null);
  useEffect(() => {
    if (data && (data.status === "done" || data.status === "failed") && refreshed.current !== followId) {
      refreshed.current = followId ?? null;
      router.refresh();
    }
  }, [data, followId, router]);
  const status = data?.status ?? latest?.status;
  const progress = data?.progress ?? latest?.progress ?? 0;
  const active = status === "queued" || status === "running";
  return (
    <div className="card flex flex-wrap items-center gap-4 px-4 py-3">
      {mayRun ? (
        <form action={formAction}>
          <input type="hidden" name="campaignId" value={campaignId} />
          <input type="hidden" name="experimentId" value={experimentId} />
          <button className="btn-primary" disabled={pending || active}>
            {active ? "Analysis running…" : "Run analysis"}
          </button>
        </form>
      ) : null}
      <div className="min-w-64 flex-1">
        {active ? (
          <div>
            <div className="mb-1 flex justify-between text-xs text-ink-muted">
              <span>{status === "queued" ? "Queued for the worker" : "Computing"}</span>
              <span className="num">{Math.round(progress * 100)} %</span>
            </div>
            <div
              className="h-2 w-full overflow-hidden rounded bg-paper-sunk"
              role="progressbar"
              aria-valuenow={Math.round(progress * 100)}
              aria-valuemin={0}
              aria-valuemax={100}
            >
              <div className="h-full bg-accent transition-all" style={{ width: `${Math.max(3, progress * 100)}%` }} />
            </div>
          </div>
        ) : status === "failed" ? (
          <p className="text-sm text-fail">
            The last analysis failed: {data?.error ?? latest?.error}. The previous results are unchanged.
          </p>
        ) : upToDate ? (
          <p className="text-sm text-ink-muted">The results below are up to date with the accepted runs and masks.</p>
        ) : latest ? (
          <p className="text-sm text-warn">
            Runs, masks or settings changed since the current results: run the analysis again.
          </p>
        ) : (
          <p className="text-sm text-ink-muted">Not analysed yet.</p>
        )}
        <FormMessage state={state} />
      </div>
    </div>
  );
}
