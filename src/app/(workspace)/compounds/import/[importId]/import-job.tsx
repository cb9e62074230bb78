"use client";
import Link from "next/link";
import { useState } from "react";
import { ApiError } from "@/hooks/fetcher";
import { apiPaths } from "@/hooks/api-paths";
import { commitCompoundImport, useImportJob, type ImportJobView } from "@/hooks/use-compounds";

const STATUS_TEXT: Record<ImportJobView["status"], string> = {
  stored: "File stored; checking starts in a moment.",
  preparing: "Checking every record: reading structures, computing properties and looking for duplicates.",
  ready: "Checked. Nothing is registered yet: choose how to register.",
  failed: "The file could not be checked.",
  committing: "Registering…",
  committed: "Registered.",
};

function ProgressBar({ done, total }: { done: number; total: number }) {
  const pct = total > 0 ? Math.round((100 * done) / total) : 0;
  return (
    <div className="flex items-center gap-3">
      <div
        className="h-2 flex-1 overflow-hidden rounded bg-paper-sunk"
        role="progressbar"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
        aria-label="Records checked"
      >
        <div className="h-full bg-accent transition-all" style={{ width: `${pct}%` }} />
      </div>
      <span className="num w-48 text-right text-xs text-ink-muted">
        {done.toLocaleString("en")} of {total.toLocaleString("en")} records ({pct} %)
      </span>
    </div>
  );
}

export function ImportJob({ id, canWrite }: { id: string; canWrite: boolean }) {
  const { data: job, error, mutate } = useImportJob(id);
  const [mode, setMode] = useState<"" | "all_or_nothing" | "valid_only">("");
  const [commitError, setCommitError] = useState<string | null>(null);
  const [committing, setCommitting] = useState(false);

  if (error) return <p className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">{error.message}</p>;
  if (!job) return <p className="text-sm text-ink-muted">Loading…</p>;
  const p = job.preview;

  async function commit() {
    if (!mode) return;
    setCommitting(true);
    setCommitError(null);
    try {
      const next = await commitCompoundImport(id, mode);
      await mutate(next, { revalidate: false });
    } catch (e) {
      setCommitError(e instanceof ApiError ? e.message : "Registering failed; nothing was registered. Try again.");
    } finally {
      setCommitting(false);
    }
  }

  return (
    <div className="flex flex-col gap-4">
      <section className="card flex flex-col gap-2 p-3">
        <div className="flex flex-wrap items-baseline gap-3 text-sm">
          <span className="font-semibold">{job.fileName}</span>
          <span className="text-xs text-ink-muted">
            {job.format.toUpperCase()} · {(job.sizeBytes / 1024).toFixed(1)} KB · SHA-256{" "}
            <code className="font-mono">{job.sha256.slice(0, 16)}…</code>
          </span>
          <span
            className={`chip ${job.status === "failed" ? "bg-fail-soft text-fail" : job.status === "committed" ? "bg-pass-soft text-pass" : "bg-info-soft text-info"}`}
          >
            {job.status}
          </span>
        </div>
        <p className="text-sm text-ink-soft">{STATUS_TEXT[job.status]}</p>
        {job.status === "preparing" || job.status === "stored" || job.status === "ready" ? (
          <ProgressBar done={job.progress.done} total={job.progress.total} />
        ) : null}
        {job.error ? (
          <p role="alert" className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">
            {job.error}
          </p>
        ) : null}
      </section>

      {p ? (
        <section className="card p-3" aria-label="Preview">
          <h2 className="mb-2 text-sm font-semibold">Preview</h2>
          <dl className="mb-3 grid grid-cols-2 gap-2 text-sm md:grid-cols-4">
            <div>
              <dt className="text-xs text-ink-muted">Records in the file</dt>
              <dd className="num text-lg">{p.totalRecords.toLocaleString("en")}</dd>
            </div>
            <div>
              <dt className="text-xs text-ink-muted">Can be registered</dt>
              <dd className="num text-lg text-pass">{p.valid.toLocaleString("en")}</dd>
            </div>
            <div>
              <dt className="text-xs text-ink-muted">With problems</dt>
              <dd className={`num text-lg ${p.invalid ? "text-fail" : ""}`} data-testid="invalid-count">
                {p.invalid.toLocaleString("en")}
              </dd>
            </div>
            <div>
              <dt className="text-xs text-ink-muted">Checked in</dt>
              <dd className="num text-lg">{(p.prepareMs / 1000).toFixed(1)} s</dd>
            </div>
          </dl>
          {p.ignoredFields.length ? (
            <p className="mb-2 text-xs text-ink-muted">Ignored columns: {p.ignoredFields.join(", ")}</p>
          ) : null}

          {p.issues.length > 0 ? (
            <>
              <h3 className="mb-1 text-xs font-semibold uppercase tracking-wide text-fail">
                Problems, record by record
              </h3>
              <div className="max-h-80 overflow-auto">
                <table className="table-dense" aria-label="Problems">
                  <thead>
                    <tr>
                      <th className="text-right">Record</th>
                      <th className="text-right">Line</th>
                      <th>Field</th>
                      <th>Problem</th>
                    </tr>
                  </thead>
                  <tbody>
                    {p.issues.map((i, k) => (
                      <tr key={k}>
                        <td className="num text-right">{i.record}</td>
                        <td className="num text-right">{i.line}</td>
                        <td className="font-mono text-xs">{i.field}</td>
                        <td>{i.message}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
              {p.issuesTotal > p.issuesShown ? (
                <p className="mt-1 text-xs text-ink-muted">
                  First {p.issuesShown} of {p.issuesTotal} problems shown;{" "}
                  {p.issuesNotStored > 0
                    ? `${p.issuesNotStored} more were found but not kept (too many to store): fix the ones listed and upload the file again.`
                    : "the report lists them all."}
                </p>
              ) : null}
            </>
          ) : (
            <p className="text-sm text-pass">No problems found.</p>
          )}

          {p.warnings.length > 0 ? (
            <details className="mt-3">
              <summary className="cursor-pointer text-xs text-warn">
                {p.warningsTotal} note(s) that do not block registration
              </summary>
              <ul className="mt-1 text-xs text-ink-soft">
                {p.warnings.map((wn, k) => (
                  <li key={k}>
                    Record {wn.record} (line {wn.line}): {wn.message}
                  </li>
                ))}
              </ul>
            </details>
          ) : null}

          {p.sample.length > 0 ? (
            <details className="mt-3" open={p.issues.length === 0}>
              <summary className="cursor-pointer text-xs text-ink-soft">
                First {p.sample.length} records that can be registered
              </summary>
              <table className="table-dense mt-1">
                <thead>
                  <tr>
                    <th className="text-right">Record</th>
                    <th>Name</th>
                    <th>Formula</th>
                    <th className="text-right">MW (g/mol)</th>
                    <th>Canonical SMILES</th>
                  </tr>
                </thead>
                <tbody>
                  {p.sample.map((s) => (
                    <tr key={s.record}>
                      <td className="num text-right">{s.record}</td>
                      <td>{s.name ?? "—"}</td>
                      <td>{s.formula}</td>
                      <td className="num text-right">{s.mw.toFixed(2)}</td>
                      <td className="max-w-xs truncate font-mono text-xs" title={s.smiles}>
                        {s.smiles}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </details>
          ) : null}
        </section>
      ) : null}

      {job.status === "ready" && p && canWrite ? (
        <section className="card flex flex-col gap-2 p-3" aria-label="Register">
          <h2 className="text-sm font-semibold">How to register</h2>
          <fieldset className="flex flex-col gap-2 text-sm">
            <legend className="sr-only">Mode</legend>
            <label className="flex items-start gap-2">
              <input
                type="radio"
                name="mode"
                value="all_or_nothing"
                checked={mode === "all_or_nothing"}
                onChange={() => setMode("all_or_nothing")}
                className="mt-1"
              />
              <span>
                <b>All or nothing</b>: register every record, or none if any record has a problem.
                {p.invalid > 0 ? (
                  <span className="block text-xs text-fail">
                    With {p.invalid} record(s) with problems, this registers nothing.
                  </span>
                ) : null}
              </span>
            </label>
            <label className="flex items-start gap-2">
              <input
                type="radio"
                name="mode"
                value="valid_only"
                checked={mode === "valid_only"}
                onChange={() => setMode("valid_only")}
                className="mt-1"
              />
              <span>
                <b>Valid records only</b>: register the {p.valid.toLocaleString("en")} record(s) without problems; the
                report lists the {p.invalid} that were not.
              </span>
            </label>
          </fieldset>
          {commitError ? (
            <p role="alert" className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">
              {commitError}
            </p>
          ) : null}
          <div className="flex gap-2">
            <button type="button" className="btn-primary" disabled={!mode || committing} onClick={commit}>
              {committing ? "Registering…" : mode ? "Register" : "Choose a mode first"}
            </button>
            <a className="btn-quiet no-underline" href={apiPaths.compoundImportReport(id)}>
              Download the problem list (CSV)
            </a>
          </div>
        </section>
      ) : null}

      {job.status === "committed" && job.result ? (
        <section className="card flex flex-col gap-2 p-3" aria-label="Outcome">
          <h2 className="text-sm font-semibold">Outcome</h2>
          <p className="text-sm">
            <b className="num">{job.result.registered.toLocaleString("en")}</b> registered
            {job.result.firstRegistryId ? (
              <>
                {" "}
                (<Link href={`/compounds/${job.result.firstRegistryId}`}>{job.result.firstRegistryId}</Link>
                {job.result.lastRegistryId && job.result.lastRegistryId !== job.result.firstRegistryId ? (
                  <>
                    {" "}
                    … <Link href={`/compounds/${job.result.lastRegistryId}`}>{job.result.lastRegistryId}</Link>
                  </>
                ) : null}
                )
              </>
            ) : null}
            ; <b className="num">{job.result.notRegistered.toLocaleString("en")}</b> problem(s) not registered. Mode:{" "}
            {job.result.mode === "valid_only" ? "valid records only" : "all or nothing"}.
          </p>
          <div>
            <a className="btn-primary no-underline" href={apiPaths.compoundImportReport(id)}>
              Download the report (CSV)
            </a>
          </div>
        </section>
      ) : null}
    </div>
  );
}
