"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { apiPaths } from "@/hooks/api-paths";
import { fetchJson } from "@/hooks/fetcher";

/**
 * Runs a failed analysis again with the same inputs (POST …/analyses/{id}/retry; the server
 * checks the role and audits it). Shown beside the failure message to people who may run analyses.
 */
export function RetryAnalysisButton({
  campaignId,
  experimentId,
  analysisId,
}: {
  campaignId: string;
  experimentId: string;
  analysisId: string;
}) {
  const router = useRouter();
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function retry() {
    setPending(true);
    setError(null);
    try {
      await fetchJson(apiPaths.analysisRetry(campaignId, experimentId, analysisId), { method: "POST" });
      router.refresh();
    } catch (e) {
      setError(e instanceof Error ? e.message : "The retry was not accepted.");
    } finally {
      setPending(false);
    }
  }
  return (
    <div className="card flex flex-wrap items-center gap-3 px-4 py-2 text-sm">
      <button type="button" className="btn-quiet" onClick={retry} disabled={pending}>
        {pending ? "Queuing…" : "Retry the failed analysis"}
      </button>
      <span className="text-ink-muted">Same runs, masks and settings; the attempt is recorded in the audit log.</span>
      {error ? (
        <span role="alert" className="text-fail">
          {error}
        </span>
      ) : null}
    </div>
  );
}
