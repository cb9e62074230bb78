"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError } from "@/hooks/fetcher";
import { startCompoundImport } from "@/hooks/use-compounds";

const MAX_MB = 25;

/** Step 1: send the file; the server stores it with its checksum and starts preparing it. */
export function ImportUploadForm() {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setError(null);
    const file = new FormData(e.currentTarget).get("file");
    if (!(file instanceof File) || file.size === 0) return setError("Choose a CSV, XLSX or SDF file.");
    if (file.size > MAX_MB * 1024 * 1024)
      return setError(`${file.name} is ${(file.size / 1024 / 1024).toFixed(1)} MB; the limit is ${MAX_MB} MB.`);
    if (!/\.(csv|tsv|txt|xlsx|sdf|sd)$/i.test(file.name))
      return setError(`${file.name}: use a .csv, .xlsx or .sdf file.`);
    setBusy(true);
    try {
      const job = await startCompoundImport(file);
      router.push(`/compounds/import/${job.id}`);
    } catch (err) {
      setError(err instanceof ApiError ? err.message : "The upload failed; check the connection and try again.");
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} className="card flex flex-col gap-3 p-4">
      <label className="text-sm" htmlFor="file">
        File (CSV, XLSX or SDF; up to {MAX_MB} MB and 10,000 records)
        <input id="file" name="file" type="file" accept=".csv,.tsv,.txt,.xlsx,.sdf,.sd" className="input mt-1" />
      </label>
      {error ? (
        <p role="alert" className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">
          {error}
        </p>
      ) : null}
      <div>
        <button className="btn-primary" disabled={busy}>
          {busy ? "Uploading…" : "Upload and check"}
        </button>
      </div>
      <p className="text-xs text-ink-muted">
        Nothing is registered at this step. The file is stored with its SHA-256 checksum, then every record is checked;
        you see the problems record by record and then choose how to register.
      </p>
    </form>
  );
}
