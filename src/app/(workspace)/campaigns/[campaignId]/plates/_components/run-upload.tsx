"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { fmtNum, fmtSig } from "./status";
import { ApiError } from "@/hooks/fetcher";
import { previewPlateRun, uploadPlateRun, type RunPreview } from "@/hooks/use-plate-runs";

type MapOption = { id: string; name: string; format: number; isTemplate: boolean };
type Detail = NonNullable<ApiError["body"]["details"]>[number];
type Item = {
  file: File;
  status: "checking" | "checked" | "invalid" | "uploading" | "stored" | "duplicate" | "failed";
  preview?: RunPreview;
  error?: string;
  details?: Detail[];
  runId?: string;
  qc?: { zPrime: number | null; verdict: "pass" | "fail" };
};

/** The server's sentence and details for a refused request; a sentence of our own when the network failed. */
function refusal(e: unknown, fallback: string): { error: string; details: Detail[] } {
  if (e instanceof ApiError) return { error: e.message, details: e.body.details ?? [] };
  return { error: fallback, details: [] };
}

/** Choose a plate map and files, check each file (nothing stored), then store and parse them. */
export function RunUpload({
  campaignId,
  maps,
  initialMapId,
}: {
  campaignId: string;
  maps: MapOption[];
  initialMapId?: string;
}) {
  const router = useRouter();
  const [mapId, setMapId] = useState(initialMapId ?? maps[0]!.id);
  const [barcode, setBarcode] = useState("");
  const [items, setItems] = useState<Item[]>([]);
  const [busy, setBusy] = useState(false);
  const runHref = (id: string) => `/campaigns/${campaignId}/plates/runs/${id}`;

  const update = (i: number, patch: Partial<Item>) =>
    setItems((xs) => xs.map((x, k) => (k === i ? { ...x, ...patch } : x)));

  async function check(files: File[]) {
    const next: Item[] = files.map((file) => ({ file, status: "checking" }));
    setItems(next);
    setBusy(true);
    for (let i = 0; i < files.length; i++) {
      try {
        update(i, { status: "checked", preview: await previewPlateRun(campaignId, mapId, files[i]!) });
      } catch (e) {
        update(i, { status: "invalid", ...refusal(e, "The file was refused.") });
      }
    }
    setBusy(false);
  }

  async function upload() {
    setBusy(true);
    let lastId: string | undefined;
    let stored = 0;
    const ready = items.map((x, i) => ({ x, i })).filter(({ x }) => x.status === "checked");
    for (const { x, i } of ready) {
      update(i, { status: "uploading" });
      try {
        const run = await uploadPlateRun(campaignId, mapId, ready.length === 1 ? barcode : "", x.file);
        stored += 1;
        lastId = run.id;
        update(i, { status: "stored", runId: run.id, qc: run.qc });
      } catch (e) {
        const dup = e instanceof ApiError && e.status === 409 && typeof e.body.runId === "string" ? e.body.runId : null;
        if (dup) update(i, { status: "duplicate", error: e instanceof Error ? e.message : "", runId: dup });
        else update(i, { status: "failed", ...refusal(e, "The upload failed.") });
      }
    }
    setBusy(false);
    if (stored === 1 && ready.length === 1 && lastId) router.push(runHref(lastId));
    else router.refresh();
  }

  const checked = items.filter((x) => x.status === "checked").length;
  return (
    <div className="flex flex-col gap-4">
      <div className="card grid gap-3 px-3 py-3 md:grid-cols-3">
        <div>
          <label className="field-label" htmlFor="plate-map">
            Plate map
          </label>
          <select
            id="plate-map"
            className="input"
            value={mapId}
            onChange={(e) => {
              setMapId(e.target.value);
              setItems([]);
            }}
          >
            {maps.map((m) => (
              <option key={m.id} value={m.id}>
                {m.name} ({m.format}-well{m.isTemplate ? ", template" : ""})
              </option>
            ))}
          </select>
        </div>
        <div>
          <label className="field-label" htmlFor="barcode">
            Plate barcode (optional, one file only)
          </label>
          <input
            id="barcode"
            className="input"
            value={barcode}
            maxLength={64}
            onChange={(e) => setBarcode(e.target.value)}
          />
        </div>
        <div>
          <label className="field-label" htmlFor="export-files">
            Reader exports
          </label>
          <input
            id="export-files"
            type="file"
            multiple
            accept=".csv,.tsv,.txt,.xlsx,text/csv,text/tab-separated-values,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
            className="block w-full text-sm"
            onChange={(e) => {
              const files = [...(e.target.files ?? [])];
              if (files.length) void check(files);
            }}
          />
        </div>
      </div>

      {items.length > 0 ? (
        <section aria-label="Parse report" className="flex flex-col gap-2">
          <h3>Parse report</h3>
          {items.map((x, i) => (
            <div key={`${x.file.name}-${i}`} className="card px-3 py-2 text-sm" data-testid="parse-report">
              <div className="flex flex-wrap items-baseline justify-between gap-2">
                <span className="font-medium">{x.file.name}</span>
                <span className="num text-2xs text-ink-muted">{(x.file.size / 1024).toFixed(1)} KB</span>
              </div>
              {x.status === "checking" || x.status === "uploading" ? (
                <p className="text-ink-muted">{x.status === "checking" ? "Checking…" : "Storing and parsing…"}</p>
              ) : null}
              {x.preview && (x.status === "checked" || x.status === "uploading") ? (
                <div className="mt-1">
                  <p>{x.preview.preview.summary}</p>
                  <p className="text-ink-soft">
                    Provisional QC: Z′ <span className="num">{fmtNum(x.preview.qc.zPrime, 3)}</span> · S/B{" "}
                    <span className="num">{fmtNum(x.preview.qc.signalToBackground, 2)}</span> · CV neutral{" "}
                    <span className="num">{fmtNum(x.preview.qc.cvNeutralPct, 1)}</span> % · CV full{" "}
                    <span className="num">{fmtNum(x.preview.qc.cvFullPct, 1)}</span> % ·{" "}
                    <span className={x.preview.qc.verdict === "pass" ? "text-pass" : "text-fail"}>
                      {x.preview.qc.verdict === "pass" ? "would pass" : "would fail"}
                    </span>
                  </p>
                  {[...x.preview.qc.reasons, ...x.preview.qc.warnings].map((r) => (
                    <p key={r} className="text-xs text-warn">
                      {r}
                    </p>
                  ))}
                  <p className="text-2xs text-ink-muted">
                    First wells:{" "}
                    {x.preview.preview.sample
                      .map((s) => `${s.well} ${fmtSig(s.value)}${s.points ? ` (${s.points} reads)` : ""}`)
                      .join(" · ")}{" "}
                    ({x.preview.qc.signalUnit === "signal units/s" ? "first read, signal units" : "signal units"})
                  </p>
                </div>
              ) : null}
              {x.status === "stored" && x.runId ? (
                <p className="text-pass">
                  Stored and parsed: Z′ <span className="num">{fmtNum(x.qc?.zPrime ?? null, 3)}</span>, QC{" "}
                  {x.qc?.verdict}. <Link href={runHref(x.runId)}>Open the run</Link>
                </p>
              ) : null}
              {x.status === "duplicate" && x.runId ? (
                <p className="text-warn">
                  {x.error} <Link href={runHref(x.runId)}>Open the earlier run</Link>
                </p>
              ) : null}
              {(x.status === "invalid" || x.status === "failed") && x.error ? (
                <div role="alert" className="mt-1 rounded bg-fail-soft px-2 py-1.5 text-fail">
                  <p>{x.error}</p>
                  {x.details && x.details.length > 1 ? (
                    <table className="table-dense mt-1 text-xs">
                      <thead>
                        <tr>
                          <th>Line / cell</th>
                          <th>Well</th>
                          <th>Problem</th>
                        </tr>
                      </thead>
                      <tbody>
                        {x.details.map((d, k) => (
                          <tr key={k}>
                            <td className="num">{d.line ?? d.field ?? ""}</td>
                            <td className="font-mono">{d.well ?? ""}</td>
                            <td>{d.message}</td>
                          </tr>
                        ))}
                      </tbody>
                    </table>
                  ) : null}
                </div>
              ) : null}
            </div>
          ))}
          <div>
            <button className="btn-primary" disabled={busy || checked === 0} onClick={() => void upload()}>
              {checked > 1 ? `Store and parse ${checked} files` : "Store and parse"}
            </button>
          </div>
        </section>
      ) : null}
    </div>
  );
}
