"use client";
import { useActionState, useCallback, useEffect, useMemo, useRef, useState } from "react";
import type { ActionState } from "@/server/action";
import { FormMessage } from "@/components/forms/form-bits";
import { formatP } from "./figures";

/**
 * Curation of one result's wells on its page: a click on a point leaves it out of the fit (or
 * puts an excluded one back) at once in a browser-side preview, each change with a reason;
 * saving stores them as the runs' audited well masks (one transaction), which the next analysis
 * uses. Nothing is stored until "Save".
 */

/** A well of the result as the page knows it. */
export type CurationWell = {
  /** `${runId}|${well}` */
  key: string;
  runId: string;
  well: string;
  /** The run's file name, to tell plates apart. */
  runLabel: string;
  /** In the stored analysis's fit (not masked in its inputs). */
  inAnalysis: boolean;
  /** Masked now (an open mask on the run): what the next analysis would leave out. */
  savedMasked: boolean;
  /** The open mask's reason, or the analysis's mask reason. */
  reason: string | null;
};

/** A change not yet saved: the well's wanted state and why. */
export type CurationEdit = { masked: boolean; reason: string };

/** The reason an accepted outlier proposal starts with (the scientist may edit it before saving). */
export const proposalReason = (qPct: string) => `proposed outlier (ROUT, Q = ${qPct} %), accepted after review`;

export function useCuration<W extends CurationWell>(wells: readonly W[]) {
  const [stored, setEdits] = useState<ReadonlyMap<string, CurationEdit>>(new Map());
  const [selected, setSelected] = useState<string | null>(null);
  const byKey = useMemo(() => new Map(wells.map((w) => [w.key, w])), [wells]);
  // After a save the page's wells carry the new masks: an edit that is now stored falls away.
  const edits = useMemo(
    () => new Map([...stored].filter(([k, e]) => byKey.has(k) && byKey.get(k)!.savedMasked !== e.masked)),
    [stored, byKey],
  );
  const isOut = useCallback((w: W) => edits.get(w.key)?.masked ?? w.savedMasked, [edits]);
  const toggle = useCallback(
    (key: string, reason = "") => {
      const w = byKey.get(key);
      if (!w) return;
      setEdits(() => {
        const next = new Map(edits);
        if (next.has(key)) next.delete(key);
        else next.set(key, { masked: !w.savedMasked, reason });
        return next;
      });
      setSelected(key);
    },
    [byKey, edits],
  );
  const setReason = useCallback((key: string, reason: string) => {
    setEdits((prev) => {
      const e = prev.get(key);
      if (!e) return prev;
      return new Map(prev).set(key, { ...e, reason });
    });
  }, []);
  const included = useMemo(() => wells.filter((w) => !isOut(w)), [wells, isOut]);
  const excluded = useMemo(() => wells.filter((w) => isOut(w)), [wells, isOut]);
  /** The wells in the fit differ from the stored analysis's (unsaved edits, or saved masks not yet analysed). */
  const differs = useMemo(() => wells.some((w) => isOut(w) === w.inAnalysis), [wells, isOut]);
  const changedKeys = useMemo(() => new Set(edits.keys()), [edits]);
  return {
    edits,
    selected,
    setSelected,
    toggle,
    setReason,
    clear: () => setEdits(new Map()),
    isOut,
    included,
    excluded,
    differs,
    changedKeys,
    byKey,
  };
}

export type Curation<W extends CurationWell> = ReturnType<typeof useCuration<W>>;

type SaveAction = (prev: ActionState, form: FormData) => Promise<ActionState>;

/**
 * The inline form under the plot: the selected well with its state and the reason for its
 * change, the list of unsaved changes, and Save. `describe` gives a well's values with units.
 */
export function CurationPanel<W extends CurationWell>({
  c,
  describe,
  mayEdit,
  action,
  campaignId,
  experimentId,
  compoundId,
}: {
  c: Curation<W>;
  describe: (w: W) => string;
  mayEdit: boolean;
  action: SaveAction;
  campaignId: string;
  experimentId: string;
  compoundId: string;
}) {
  const [state, formAction, pending] = useActionState(action, null);
  const reasonRef = useRef<HTMLInputElement>(null);
  const sel = c.selected ? c.byKey.get(c.selected) : undefined;
  const selEdit = sel ? c.edits.get(sel.key) : undefined;
  useEffect(() => {
    if (selEdit) reasonRef.current?.focus();
  }, [sel?.key, selEdit]);
  const changes = [...c.edits].flatMap(([k, e]) => {
    const w = c.byKey.get(k);
    return w ? [{ w, e }] : [];
  });
  const missing = changes.filter(({ e }) => e.reason.trim().length < 3).length;
  const payload = JSON.stringify(
    changes.map(({ w, e }) => ({ runId: w.runId, well: w.well, masked: e.masked, reason: e.reason.trim() })),
  );
  const status = (w: W) =>
    c.edits.has(w.key)
      ? c.isOut(w)
        ? "left out of the fit (preview, not saved)"
        : "back in the fit (preview, not saved)"
      : w.savedMasked
        ? `excluded: ${w.reason ?? "masked"}`
        : "in the fit";
  return (
    <div className="card flex flex-col gap-2 p-3 text-sm" aria-label="Curation">
      {sel ? (
        <div className="flex flex-wrap items-end gap-3" data-testid="curation-selected">
          <div className="min-w-56">
            <p className="text-xs text-ink-muted">Selected well</p>
            <p className="num">{describe(sel)}</p>
            <p className="text-xs text-ink-soft">{status(sel)}</p>
          </div>
          {mayEdit && selEdit ? (
            <label className="min-w-72 flex-1">
              <span className="field-label">
                Reason to {selEdit.masked ? "exclude" : "restore"} {sel.well} (kept in the audit log)
              </span>
              <input
                ref={reasonRef}
                className="input"
                id="curation-reason"
                value={selEdit.reason}
                onChange={(e) => c.setReason(sel.key, e.target.value)}
                placeholder={
                  selEdit.masked ? "e.g. bubble seen in this well at read-out" : "e.g. reading confirmed valid"
                }
              />
            </label>
          ) : null}
          {mayEdit ? (
            <button type="button" className="btn-quiet" onClick={() => c.toggle(sel.key)}>
              {selEdit ? "Undo this change" : c.isOut(sel) ? `Restore ${sel.well}` : `Exclude ${sel.well}`}
            </button>
          ) : null}
        </div>
      ) : (
        <p className="text-xs text-ink-muted">
          {mayEdit
            ? "Click a point to leave it out of the fit, or an excluded point (red cross) to put it back. The fit updates here at once; nothing is stored until you save, with a reason for each well."
            : "Only assay scientists and administrators can exclude wells; you see the stored result."}
        </p>
      )}
      {changes.length ? (
        <form action={formAction} className="flex flex-col gap-2 border-t border-rule pt-2">
          <input type="hidden" name="campaignId" value={campaignId} />
          <input type="hidden" name="experimentId" value={experimentId} />
          <input type="hidden" name="compoundId" value={compoundId} />
          <input type="hidden" name="edits" value={payload} />
          <p className="text-xs font-medium text-ink-muted">
            Unsaved changes ({changes.length}) <span className="chip bg-warn-soft text-warn">preview, not saved</span>
          </p>
          <ul className="flex flex-col gap-1">
            {changes.map(({ w, e }) => (
              <li key={w.key} className="flex flex-wrap items-center gap-2">
                <button
                  type="button"
                  className="num text-left text-accent hover:text-accent-strong"
                  onClick={() => c.setSelected(w.key)}
                >
                  {e.masked ? "exclude" : "restore"} {describe(w)}
                </button>
                <span className={e.reason.trim().length < 3 ? "text-xs text-fail" : "text-xs text-ink-soft"}>
                  {e.reason.trim().length < 3 ? "reason needed" : `“${e.reason.trim()}”`}
                </span>
              </li>
            ))}
          </ul>
          <div className="flex flex-wrap items-center gap-3">
            <button className="btn-primary" disabled={pending || missing > 0}>
              Save {changes.length} {changes.length === 1 ? "change" : "changes"} as well masks
            </button>
            <button type="button" className="btn-quiet" onClick={c.clear} disabled={pending}>
              Discard
            </button>
            {missing ? (
              <span className="text-xs text-fail">
                Give a reason (at least 3 characters) for {missing === 1 ? "the change" : `${missing} changes`} marked.
              </span>
            ) : (
              <span className="text-xs text-ink-muted">
                Stored as audited masks on the plate runs; the next analysis of every experiment using these runs leaves
                them out.
              </span>
            )}
          </div>
        </form>
      ) : null}
      <FormMessage state={state} />
    </div>
  );
}

/** The proposed outliers of a result, each with its figures and a one-click exclusion (with the proposal's reason). */
export function OutlierProposals<W extends CurationWell>({
  proposed,
  describe,
  residualNote,
  mayEdit,
  onExclude,
}: {
  proposed: { w: W; o: { residual: number | null; p: number | null } }[];
  describe: (w: W) => string;
  residualNote: string;
  mayEdit: boolean;
  onExclude: (w: W) => void;
}) {
  return (
    <ul className="flex flex-col gap-1">
      {proposed.map(({ w, o }) => (
        <li key={w.key} className="flex flex-wrap items-center gap-x-2 gap-y-1">
          <span className="num">{describe(w)}</span>
          {o.residual !== null ? (
            <span className="num text-xs text-ink-muted">
              standardised residual {o.residual.toFixed(1)} ({residualNote}){o.p !== null ? `, p ${formatP(o.p)}` : ""}
            </span>
          ) : null}
          {mayEdit ? (
            <button type="button" className="btn-quiet py-0.5" onClick={() => onExclude(w)}>
              Exclude {w.well}
            </button>
          ) : null}
        </li>
      ))}
    </ul>
  );
}
