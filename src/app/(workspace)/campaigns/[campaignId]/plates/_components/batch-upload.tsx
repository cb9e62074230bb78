"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { apiPaths } from "@/hooks/api-paths";
import { fetchJson, ApiError } from "@/hooks/fetcher";
import type { BatchView } from "@/server/services/plates/batches";

type MapOption = { id: string; name: string };
type Phase =
  | { kind: "idle" }
  | { kind: "sending"; pct: number }
  | { kind: "parsing"; done: number; total: number }
  | { kind: "error"; message: string };

/** Sends the form with XMLHttpRequest, which (unlike fetch) reports upload progress. */
function send(url: string, form: FormData, onProgress: (pct: number) => void): Promise<BatchView> {
  return new Promise((resolve, reject) => {
    const x = new XMLHttpRequest();
    x.open("POST", url);
    x.upload.onprogress = (e) => e.lengthComputable && onProgress(Math.round((100 * e.loaded) / e.total));
    x.onload = () => {
      let body: unknown = null;
      try {
        body = JSON.parse(x.responseText);
      } catch {
        body = { error: `The server answered ${x.status} with something that is not JSON.` };
      }
      if (x.status >= 200 && x.status < 300) resolve(body as BatchView);
      else reject(new ApiError(x.status, (body ?? {}) as ApiError["body"]));
    };
    x.onerror = () => reject(new Error("The upload did not reach the server (network error)."));
    x.send(form);
  });
}

/**
 * A day's plates at once: many exports or one .zip, an optional manifest CSV
 * (file_name,barcode,plate_map) and a plate map for files nothing else matches. Two progress
 * bars: bytes sent, then files parsed (the batch is polled); then the batch's review screen.
 */
export function BatchUpload({ campaignId, maps }: { campaignId: string; maps: MapOption[] }) {
  const router = useRouter();
  const [files, setFiles] = useState<File[]>([]);
  const [manifest, setManifest] = useState<File | null>(null);
  const [mapId, setMapId] = useState("");
  const [phase, setPhase] = useState<Phase>({ kind: "idle" });
  const busy = phase.kind === "sending" || phase.kind === "parsing";

  async function start() {
    const form = new FormData();
    for (const f of files) form.append("file", f);
    if (manifest) form.append("manifest", manifest);
    if (mapId) form.append("plateMapId", mapId);
    setPhase({ kind: "sending", pct: 0 });
    try {
      let b = await send(apiPaths.plateBatches(campaignId), form, (pct) => setPhase({ kind: "sending", pct }));
      while (b.status === "processing") {
        setPhase({ kind: "parsing", done: b.counts.total - b.counts.pending, total: b.counts.total });
        await new Promise((r) => setTimeout(r, 700));
        b = await fetchJson<BatchView>(apiPaths.plateBatch(campaignId, b.id));
      }
      setPhase({ kind: "parsing", done: b.counts.total, total: b.counts.total });
      router.push(`/campaigns/${campaignId}/plates/batches/${b.id}`);
    } catch (e) {
      setPhase({ kind: "error", message: e instanceof Error ? e.message : "The batch was refused." });
    }
  }

  const pct =
    phase.kind === "sending"
      ? phase.pct
      : phase.kind === "parsing"
        ? Math.round((100 * phase.done) / Math.max(1, phase.total))
        : 0;
  return (
    <section className="card flex flex-col gap-3 px-3 py-3" aria-labelledby="batch-upload-title">
      <div>
        <h3 id="batch-upload-title">Upload a day&apos;s plates</h3>
        <p className="text-2xs text-ink-muted">
          Many reader exports (CSV, TSV, XLSX) or one .zip of them. Each file is stored with its SHA-256 and parsed on
          its own; a bad or repeated file is reported and the others go on. The plate map comes from the manifest, else
          a plate map&apos;s name in the export&apos;s barcode or the file name, else the default below; files left
          unmatched are listed for you to assign.
        </p>
      </div>
      <div className="flex flex-wrap items-end gap-3">
        <label className="flex flex-col gap-1 text-sm">
          <span className="field-label">Exports or .zip</span>
          <input
            type="file"
            multiple
            accept=".csv,.tsv,.txt,.xlsx,.zip"
            aria-label="Reader exports or a zip of them"
            disabled={busy}
            onChange={(e) => setFiles([...(e.target.files ?? [])])}
          />
        </label>
        <label className="flex flex-col gap-1 text-sm">
          <span className="field-label">Manifest CSV (optional)</span>
          <input
            type="file"
            accept=".csv"
            aria-label="Manifest CSV"
            disabled={busy}
            onChange={(e) => setManifest(e.target.files?.[0] ?? null)}
          />
        </label>
        <label className="flex flex-col gap-1 text-sm">
          <span className="field-label">Plate map for unmatched files</span>
          <select className="input" value={mapId} disabled={busy} onChange={(e) => setMapId(e.target.value)}>
            <option value="">none — list them for me to assign</option>
            {maps.map((m) => (
              <option key={m.id} value={m.id}>
                {m.name}
              </option>
            ))}
          </select>
        </label>
        <button className="btn-primary" disabled={busy || files.length === 0} onClick={start}>
          Upload {files.length > 0 ? `${files.length} file${files.length > 1 ? "s" : ""}` : "batch"}
        </button>
      </div>
      {busy ? (
        <div>
          <div className="mb-1 text-2xs text-ink-muted" aria-live="polite">
            {phase.kind === "sending"
              ? `Sending: ${phase.pct} %`
              : `Parsing and checking: ${phase.done} of ${phase.total} files`}
          </div>
          <div
            className="h-2 w-full overflow-hidden rounded bg-paper-sunk"
            role="progressbar"
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={pct}
            aria-label={phase.kind === "sending" ? "Upload progress" : "Parsing progress"}
          >
            <div className="h-full bg-accent transition-all" style={{ width: `${pct}%` }} />
          </div>
        </div>
      ) : null}
      {phase.kind === "error" ? (
        <p role="alert" className="text-sm text-fail">
          {phase.message}
        </p>
      ) : null}
    </section>
  );
}
