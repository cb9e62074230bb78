"use client";
import Link from "next/link";
import { useEffect, useState } from "react";
import { formatConcentration, formatConcentrationRange } from "@/lib/units";
import { isTriageStatus, triageLabels, triageStatuses, type TriageStatus } from "@/lib/hits/query";
import { INHIBITION_MODELS, type InhibitionModel } from "@/lib/kinetics/inhibition-models";
import { isFittedDoseResponse, isFittedMechanism, parseResultDetail } from "@/lib/analysis/detail";
import { hitActions, hitStructureUrl, useHitDetail, type HitDetail } from "@/hooks/use-hits";
import { DoseResponsePlot } from "@/components/plots/dose-response-plot";
import { DoubleReciprocalPlot, RateVsSubstratePlot } from "@/components/plots/mechanism-plots";
import { Flags, kindLabel } from "../../analyses/_components/labels";
import { MechanismCell, StatusChip } from "./status";
import { formatAlpha } from "@/lib/analysis/alpha";

type Props = {
  campaignId: string;
  registryId: string;
  canTriage: boolean;
  canComment: boolean;
  onClose: () => void;
  onChanged: () => void;
};

const when = (iso: string) => new Date(iso).toLocaleString("en-GB", { dateStyle: "medium", timeStyle: "short" });
const fixed = (v: number | null | undefined, d: number) =>
  v === null || v === undefined || !Number.isFinite(v) ? "—" : v.toFixed(d);
const messageOf = (e: unknown) => (e instanceof Error ? e.message : String(e));
const isModel = (m: string | undefined): m is InhibitionModel => INHIBITION_MODELS.some((x) => x === m);

/** A stored detail read through its schema, or the sentence that says where it does not match. */
function readDetail<T>(parse: () => T): { ok: true; detail: T } | { ok: false; message: string } {
  try {
    return { ok: true, detail: parse() };
  } catch (e) {
    return { ok: false, message: messageOf(e) };
  }
}

/** The compound panel: opens beside the grid (the grid stays where it was). */
export function HitPanel({ campaignId, registryId, canTriage, canComment, onClose, onChanged }: Props) {
  const { data, error, mutate } = useHitDetail(campaignId, registryId);
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => e.key === "Escape" && onClose();
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [onClose]);

  return (
    <aside
      className="fixed inset-y-0 right-0 z-40 flex w-[600px] max-w-full flex-col border-l border-rule-strong bg-paper-raised shadow-card"
      role="dialog"
      aria-label={`Compound ${registryId}`}
      data-testid="hit-panel"
    >
      <header className="flex items-start gap-3 border-b border-rule px-4 py-3">
        <div className="min-w-0 flex-1">
          <p className="font-mono text-lg font-semibold">{registryId}</p>
          <p className="truncate text-xs text-ink-muted">{data?.compound?.name ?? ""}</p>
        </div>
        {data ? <StatusChip status={data.row.status} /> : null}
        <button
          type="button"
          className="btn-quiet px-2 py-0.5 text-xs"
          onClick={onClose}
          aria-label="Close the compound panel"
        >
          Close
        </button>
      </header>
      <div className="flex-1 overflow-y-auto px-4 py-3">
        {error ? <p className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">{error.message}</p> : null}
        {!data ? (
          <p className="text-sm text-ink-muted">Loading…</p>
        ) : (
          <PanelBody
            campaignId={campaignId}
            d={data}
            canTriage={canTriage}
            canComment={canComment}
            onChanged={() => (void mutate(), onChanged())}
          />
        )}
      </div>
    </aside>
  );
}

function PanelBody({
  campaignId,
  d,
  canTriage,
  canComment,
  onChanged,
}: {
  campaignId: string;
  d: HitDetail;
  canTriage: boolean;
  canComment: boolean;
  onChanged: () => void;
}) {
  const r = d.row;
  return (
    <div className="flex flex-col gap-5 text-sm">
      <section className="grid grid-cols-[200px_1fr] gap-3">
        {/* eslint-disable-next-line @next/next/no-img-element -- server-drawn SVG */}
        <img
          src={hitStructureUrl(campaignId, r.registryId, "large")}
          alt={`Structure of ${r.registryId}`}
          width={200}
          height={150}
          className="rounded border border-rule bg-white"
        />
        <table className="table-dense">
          <tbody>
            <Row label="Mechanism">
              <MechanismCell mechanism={r.mechanism} label={r.mechanismLabel} flags={r.flags} />
            </Row>
            <Row label="Ki (95 % CI)">
              {formatConcentration(r.ki)}
              {r.ki !== null ? (
                <span className="text-ink-muted"> ({formatConcentrationRange(r.kiCi95[0], r.kiCi95[1])})</span>
              ) : null}
            </Row>
            <Row label="α = Kiu/Kic">{formatAlpha(r.alpha, r.mechanism)}</Row>
            <Row label="IC50 (95 % CI)">
              {r.ic50Qualifier ?? ""}
              {formatConcentration(r.ic50)}
              {r.ic50 !== null && r.ic50Ci95[0] !== null ? (
                <span className="text-ink-muted">
                  {" "}
                  ({formatConcentration(r.ic50Ci95[0])} – {formatConcentration(r.ic50Ci95[1])})
                </span>
              ) : null}
            </Row>
            <Row label="Hill slope">{fixed(r.hill, 2)}</Row>
            <Row label="Single-dose inhibition">
              {r.pctInhibition === null ? "—" : `${r.pctInhibition.toFixed(1)} %${r.hit ? " (hit)" : ""}`}
            </Row>
            <Row label="pKi · LE · LipE">
              {r.pKi === null ? (
                <span className="text-ink-muted">— (need a Ki from a mechanism study)</span>
              ) : (
                <>
                  {fixed(r.pKi, 2)} · LE {fixed(r.le, 2)} kcal/mol per heavy atom · LipE {fixed(r.lipe, 2)}
                </>
              )}
            </Row>
            <Row label="MW · cLogP · heavy atoms">
              {fixed(r.mw, 1)} g/mol · {fixed(r.clogp, 2)} · {r.heavyAtoms ?? "—"}
            </Row>
          </tbody>
        </table>
      </section>
      {d.compound ? (
        <p className="break-all font-mono text-2xs text-ink-muted">
          {d.compound.formula} · {d.compound.smiles}
        </p>
      ) : null}
      <section>
        <h3 className="mb-1">Flags</h3>
        {r.flags.length || r.mechanismLabel === "ambiguous" ? (
          <Flags flags={r.flags.length ? r.flags : ["ambiguous-mechanism"]} />
        ) : (
          <p className="text-xs text-pass">No flags on the current results.</p>
        )}
      </section>

      {canTriage ? (
        <TriageForm campaignId={campaignId} registryId={r.registryId} current={r.status} onDone={onChanged} />
      ) : null}

      {d.results.map((res) => (
        <ResultSection key={res.experimentId} campaignId={campaignId} registryId={r.registryId} res={res} />
      ))}

      <section>
        <h3 className="mb-1">Status history</h3>
        {d.history.length === 0 ? (
          <p className="text-xs text-ink-muted">Unreviewed: no decision yet.</p>
        ) : (
          <ol className="flex flex-col gap-1.5" data-testid="status-history">
            {d.history.map((h) => (
              <li key={h.id} className="rounded border border-rule px-2 py-1">
                <p className="text-xs">
                  <StatusChip status={h.from} /> → <StatusChip status={h.to} />{" "}
                  <span className="text-ink-muted">
                    by {h.by ?? "a removed user"} · {when(h.at)}
                  </span>
                </p>
                {h.comment ? <p className="mt-0.5 text-xs text-ink-soft">{h.comment}</p> : null}
              </li>
            ))}
          </ol>
        )}
      </section>

      <section>
        <h3 className="mb-1">Comments</h3>
        {canComment ? <CommentForm campaignId={campaignId} registryId={r.registryId} onDone={onChanged} /> : null}
        {d.comments.length === 0 ? (
          <p className="text-xs text-ink-muted">No comments yet.</p>
        ) : (
          <ul className="mt-2 flex flex-col gap-1.5">
            {d.comments.map((c) => (
              <li key={c.id} className="rounded border border-rule px-2 py-1 text-xs">
                <p className="whitespace-pre-line text-ink">{c.body}</p>
                <p className="text-ink-muted">
                  {c.by ?? "a removed user"} · {when(c.at)}
                </p>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section>
        <h3 className="mb-1">Batches</h3>
        {d.batches.length === 0 ? (
          <p className="text-xs text-ink-muted">No batches recorded.</p>
        ) : (
          <table className="table-dense">
            <thead>
              <tr>
                <th>Batch</th>
                <th>Supplier</th>
                <th className="text-right">Purity (%)</th>
                <th>Salt form</th>
                <th>Date</th>
              </tr>
            </thead>
            <tbody>
              {d.batches.map((b) => (
                <tr key={b.batchNumber}>
                  <td className="num">{b.batchNumber}</td>
                  <td>{b.supplier ?? "—"}</td>
                  <td className="num text-right">{b.purityPct ?? "—"}</td>
                  <td>{b.saltForm ?? "—"}</td>
                  <td className="num">{b.batchDate ?? "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <p className="mt-1 text-2xs text-ink-muted">
          <Link href={`/compounds/${r.registryId}`}>Open the compound&rsquo;s registry page</Link>
        </p>
      </section>
    </div>
  );
}

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <tr>
      <td className="whitespace-nowrap text-xs text-ink-muted">{label}</td>
      <td className="num">{children}</td>
    </tr>
  );
}

function ResultSection({
  campaignId,
  registryId,
  res,
}: {
  campaignId: string;
  registryId: string;
  res: HitDetail["results"][number];
}) {
  const href = `/campaigns/${campaignId}/analyses/${res.experimentId}/${registryId}`;
  const head = (
    <p className="mb-1 flex items-baseline gap-2">
      <span className="text-xs font-semibold uppercase tracking-wide text-ink-muted">{kindLabel[res.kind]}</span>
      <Link href={href} className="truncate text-xs">
        {res.experimentName}
      </Link>
      <span className="ml-auto text-2xs text-ink-faint">{res.nPoints} wells</span>
    </p>
  );
  const unreadable = (message: string) => (
    <section>
      {head}
      <p className="text-xs text-fail">{message}</p>
    </section>
  );
  if (res.kind === "dose-response") {
    const read = readDetail(() => parseResultDetail("dose-response", res.detail));
    if (!read.ok) return unreadable(read.message);
    const det = read.detail;
    if (!det.points.length) return <section>{head}</section>;
    return (
      <section>
        {head}
        <div className="rounded border border-rule">
          <DoseResponsePlot
            points={det.points.map((p) => [p[0], p[1]])}
            masked={[]}
            fit={isFittedDoseResponse(det) ? det.fit : null}
            height={320}
          />
        </div>
      </section>
    );
  }
  if (res.kind === "mechanism") {
    const read = readDetail(() => parseResultDetail("mechanism", res.detail));
    if (!read.ok) return unreadable(read.message);
    const det = read.detail;
    if (!isFittedMechanism(det)) return <section>{head}</section>;
    const override = res.override?.model;
    const chosen = isModel(override) ? override : det.best;
    const fit = det.models[chosen];
    const pts = det.points.flatMap<[number, number, number]>(([s, i, v]) => (v === null ? [] : [[s, i, v]]));
    if (!pts.length) return <section>{head}</section>;
    return (
      <section>
        {head}
        <div className="flex flex-col gap-2">
          <div className="rounded border border-rule">
            <RateVsSubstratePlot points={pts} model={chosen} fit={fit} rateUnit="signal/s" />
          </div>
          <div className="rounded border border-rule">
            <DoubleReciprocalPlot points={pts} model={chosen} fit={fit} rateUnit="signal/s" />
          </div>
        </div>
      </section>
    );
  }
  return <section>{head}</section>;
}

function TriageForm({
  campaignId,
  registryId,
  current,
  onDone,
}: {
  campaignId: string;
  registryId: string;
  current: TriageStatus;
  onDone: () => void;
}) {
  const [status, setStatus] = useState<TriageStatus>(current === "unreviewed" ? "confirmed" : current);
  const [comment, setComment] = useState("");
  const [busy, setBusy] = useState(false);
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    try {
      await hitActions.setStatus(campaignId, registryId, status, comment);
      setMsg({ ok: true, text: `Recorded: ${triageLabels[status]}.` });
      setComment("");
      onDone();
    } catch (err) {
      setMsg({ ok: false, text: messageOf(err) });
    } finally {
      setBusy(false);
    }
  }
  return (
    <form onSubmit={submit} className="card flex flex-col gap-2 p-3" aria-label="Triage decision">
      <h3>Triage decision</h3>
      <div className="flex gap-2">
        <select
          className="input w-40"
          value={status}
          onChange={(e) => isTriageStatus(e.target.value) && setStatus(e.target.value)}
          aria-label="New status"
          name="status"
        >
          {triageStatuses.map((s) => (
            <option key={s} value={s}>
              {triageLabels[s]}
            </option>
          ))}
        </select>
        <input
          className="input flex-1"
          value={comment}
          onChange={(e) => setComment(e.target.value)}
          placeholder="why (kept in the history)"
          maxLength={2000}
          name="comment"
        />
        <button type="submit" className="btn-primary" disabled={busy || status === current}>
          Record
        </button>
      </div>
      {msg ? (
        <p role={msg.ok ? "status" : "alert"} className={`text-xs ${msg.ok ? "text-pass" : "text-fail"}`}>
          {msg.text}
        </p>
      ) : null}
      <p className="text-2xs text-ink-muted">
        A decision is for research triage: review the fits and flags above first.
      </p>
    </form>
  );
}

function CommentForm({
  campaignId,
  registryId,
  onDone,
}: {
  campaignId: string;
  registryId: string;
  onDone: () => void;
}) {
  const [body, setBody] = useState("");
  const [err, setErr] = useState<string | null>(null);
  async function submit(e: React.FormEvent) {
    e.preventDefault();
    try {
      await hitActions.comment(campaignId, registryId, body);
      setBody("");
      setErr(null);
      onDone();
    } catch (x) {
      setErr(messageOf(x));
    }
  }
  return (
    <form onSubmit={submit} className="flex flex-col gap-1">
      <textarea
        className="input h-16"
        value={body}
        onChange={(e) => setBody(e.target.value)}
        placeholder="Add a comment for the team"
        maxLength={4000}
        aria-label="Comment"
      />
      <div className="flex items-center gap-2">
        <button type="submit" className="btn-quiet py-0.5 text-xs" disabled={!body.trim()}>
          Add comment
        </button>
        {err ? <span className="text-xs text-fail">{err}</span> : null}
      </div>
    </form>
  );
}
