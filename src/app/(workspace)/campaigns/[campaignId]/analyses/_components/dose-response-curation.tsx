"use client";
import { useMemo } from "react";
import type { ActionState } from "@/server/action";
import { analyseDoseResponseCompound } from "@/lib/analysis/compute";
import { parseResultDetail, type DoseResponseDetail } from "@/lib/analysis/detail";
import { formatConcentration, formatConcentrationRange } from "@/lib/units";
import { DoseResponsePlot, type PlotWell } from "@/components/plots/dose-response-plot";
import { CurationPanel, OutlierProposals, proposalReason, useCuration, type CurationWell } from "./curation";
import { LackOfFitShort, RunsShort, WeightingShort, WeightingText, qText } from "./figures";
import { OUTLIER_Q } from "@/lib/analysis/settings";
import { Flags } from "./labels";

export type DoseResponseWell = CurationWell & { concentrationUm: number; inhibitionPct: number };

/** A dose-response result as the page shows it: the stored row's columns, or a preview's. */
export type DoseResponseView = {
  ic50Um: number | null;
  ic50LoUm: number | null;
  ic50HiUm: number | null;
  ic50Qualifier: ">" | "<" | null;
  hill: number | null;
  nPoints: number;
  flags: string[];
  detail: DoseResponseDetail;
};

type Options = Parameters<typeof analyseDoseResponseCompound>[2];

/** The parts of a detail the page reads, whichever record it is (fitted, called, too few). */
function partsOf(d: DoseResponseDetail) {
  const fit = "fit" in d ? d.fit : "curve" in d ? d.curve : null;
  return {
    outcome: "outcome" in d && d.outcome ? d.outcome : "fit" in d ? "fitted" : ("too-few-points" as const),
    reason: "reason" in d ? d.reason : null,
    maxActivationPct: "maxActivationPct" in d ? (d.maxActivationPct ?? null) : null,
    ic50BracketUm: "ic50BracketUm" in d ? (d.ic50BracketUm ?? null) : null,
    fit,
    maxInhibitionPct: "maxInhibitionPct" in d ? (d.maxInhibitionPct ?? null) : null,
    testedRangeUm: "testedRangeUm" in d ? d.testedRangeUm : null,
    adequacy: "adequacy" in d ? d.adequacy : undefined,
    weighting: "weighting" in d ? d.weighting : undefined,
    outliers: "outliers" in d ? d.outliers : undefined,
    morrison: "morrison" in d ? d.morrison : null,
  };
}

const outcomeText = {
  fitted: "IC50 determined",
  inactive: "inactive",
  activator: "activator: the signal rises, not an inhibitor",
  "not-determined": "not determined",
  "too-few-points": "not determined: too few concentrations or wells",
} as const;

function OutcomeCell({ v }: { v: DoseResponseView }) {
  const p = partsOf(v.detail);
  const bad = p.outcome !== "fitted";
  return (
    <span className={bad ? "font-medium text-warn" : ""}>
      {outcomeText[p.outcome]}
      {p.reason ? <span className="block text-xs font-normal text-ink-soft">{p.reason}</span> : null}
      {p.maxActivationPct !== null ? (
        <span className="block text-xs font-normal text-ink-soft">
          largest rise above vehicle: {p.maxActivationPct.toFixed(1)} % activity
        </span>
      ) : null}
      {p.ic50BracketUm ? (
        <span className="block text-xs font-normal text-ink-soft">
          IC50 lies between the tested {formatConcentration(p.ic50BracketUm[0])} and{" "}
          {formatConcentration(p.ic50BracketUm[1])}
        </span>
      ) : null}
    </span>
  );
}

/** One row of the figures table: the label with its unit, the stored value, the preview's. */
function Row({ label, stored, preview }: { label: string; stored: React.ReactNode; preview?: React.ReactNode }) {
  return (
    <tr>
      <td className="w-2/5 text-ink-muted">{label}</td>
      <td className="num text-right">{stored}</td>
      {preview !== undefined ? <td className="num bg-warn-soft/40 text-right">{preview}</td> : null}
    </tr>
  );
}

const pct = (x: number | null | undefined, digits = 1) =>
  x === null || x === undefined || !Number.isFinite(x) ? "—" : `${x.toFixed(digits)} %`;

function figures(v: DoseResponseView) {
  const p = partsOf(v.detail);
  return {
    outcome: <OutcomeCell v={v} />,
    ic50: (
      <span className="font-semibold">
        {v.ic50Um === null ? "none" : `${v.ic50Qualifier ?? ""}${formatConcentration(v.ic50Um)}`}
      </span>
    ),
    ci: formatConcentrationRange(v.ic50LoUm, v.ic50HiUm),
    hill: v.hill === null ? "—" : v.hill.toFixed(2),
    plateaus: `${pct(p.fit?.topPct)} / ${pct(p.fit?.bottomPct)}`,
    max: pct(p.maxInhibitionPct),
    r2: p.fit?.rSquared == null ? "—" : p.fit.rSquared.toFixed(3),
    lof: <LackOfFitShort a={p.adequacy} />,
    runs: <RunsShort a={p.adequacy} />,
    verdict: !p.adequacy ? (
      "—"
    ) : p.adequacy.adequate ? (
      <span className="text-pass">adequate</span>
    ) : (
      <span className="font-medium text-fail">inadequate</span>
    ),
    weighting: <WeightingShort w={p.weighting} />,
    outliers:
      p.outliers === null
        ? "none"
        : p.outliers
          ? p.outliers.proposed.length === 0
            ? "none"
            : `${p.outliers.proposed.length} (Q = ${qText(p.outliers.q)} %)${p.outliers.reported === "without-outliers" ? ", left out" : ""}`
          : "—",
    wells: String(v.nPoints),
    range: p.testedRangeUm
      ? `${formatConcentration(p.testedRangeUm[0])} – ${formatConcentration(p.testedRangeUm[1])}`
      : "—",
    flags: <Flags flags={v.flags} />,
  };
}

const keyOf = (runId: string, well: string) => `${runId}|${well}`;

/**
 * The dose-response result with curation: the plot (click a point to leave it out or put it
 * back), the figures of the stored analysis and, while wells differ from it, of a preview the
 * browser computes with the pipeline's own function on the current wells.
 */
export function DoseResponseCuration({
  campaignId,
  experimentId,
  compoundId,
  wells,
  stored,
  options,
  mayEdit,
  action,
}: {
  campaignId: string;
  experimentId: string;
  compoundId: string;
  wells: DoseResponseWell[];
  stored: DoseResponseView;
  options: Options;
  mayEdit: boolean;
  action: (prev: ActionState, form: FormData) => Promise<ActionState>;
}) {
  const c = useCuration(wells);
  const preview = useMemo((): { view: DoseResponseView | null; error: string | null } | null => {
    if (!c.differs) return null;
    if (c.included.length === 0) return { view: null, error: "No wells left in the fit." };
    // The pipeline's order (run, then well), so the residuals' order and the fit are the same.
    const pts = [...c.included]
      .sort((a, b) => (a.runId === b.runId ? a.well.localeCompare(b.well) : a.runId.localeCompare(b.runId)))
      .map((w) => ({
        concentrationUm: w.concentrationUm,
        inhibitionPct: w.inhibitionPct,
        runId: w.runId,
        well: w.well,
      }));
    try {
      const r = analyseDoseResponseCompound(compoundId, pts, options);
      return {
        view: {
          ic50Um: r.ic50Um ?? null,
          ic50LoUm: r.ic50LoUm ?? null,
          ic50HiUm: r.ic50HiUm ?? null,
          ic50Qualifier: r.ic50Qualifier ?? null,
          hill: r.hill ?? null,
          nPoints: r.nPoints,
          flags: r.flags,
          detail: parseResultDetail("dose-response", r.detail),
        },
        error: null,
      };
    } catch (e) {
      return { view: null, error: e instanceof Error ? e.message : String(e) };
    }
  }, [c.differs, c.included, compoundId, options]);
  const shown = preview?.view ?? (preview ? null : stored);
  const shownParts = shown ? partsOf(shown.detail) : null;
  const storedParts = partsOf(stored.detail);
  const describe = (w: DoseResponseWell) =>
    `${w.well} · ${w.runLabel} · ${formatConcentration(w.concentrationUm)} · ${w.inhibitionPct.toFixed(1)} % inhibition`;
  const asPlot = (w: DoseResponseWell): PlotWell => ({
    key: w.key,
    x: w.concentrationUm,
    y: w.inhibitionPct,
    label: `${w.well} · ${w.runLabel}${w.savedMasked && w.reason ? ` · masked: ${w.reason}` : ""}`,
  });
  const inPlot = c.included.map(asPlot);
  const outPlot = c.excluded.map(asPlot);
  const proposed = (shownParts?.outliers?.proposed ?? []).flatMap((o) => {
    const w = c.byKey.get(keyOf(o.runId, o.well));
    return w && !c.isOut(w) ? [{ w, o }] : [];
  });
  const qPct = qText(shownParts?.outliers?.q ?? OUTLIER_Q);
  const proposalLabel = `proposed: outlier (ROUT, Q = ${qPct} %)`;
  const unsaved = c.edits.size > 0;
  const previewLabel = unsaved ? "Preview, not saved" : "Saved masks, not yet analysed";
  const pf = preview?.view ? figures(preview.view) : null;
  const sf = figures(stored);
  const previewCell = (k: keyof typeof sf) => (preview ? (pf ? pf[k] : "—") : undefined);
  return (
    <section className="flex flex-col gap-3" aria-label="Dose-response result">
      {preview ? (
        <p role="status" className="rounded border border-warn/40 bg-warn-soft px-3 py-1.5 text-sm text-ink-soft">
          <b className="font-semibold text-warn">{previewLabel}.</b>{" "}
          {unsaved
            ? "The curve and figures marked as preview are computed here in the browser from the wells now in the fit; the stored result is unchanged until you save and run the analysis again."
            : "These wells are masked on their runs, but the stored result was computed before: run the analysis again to store the figures marked as preview."}
          {preview.error ? <span className="block text-fail">The preview fit failed: {preview.error}</span> : null}
        </p>
      ) : null}
      <div className="grid gap-4 lg:grid-cols-[3fr_2fr]">
        <div className="flex flex-col gap-2">
          <div className="card p-2" data-testid="dose-response-plot">
            <DoseResponsePlot
              points={inPlot.map((p) => [p.x, p.y])}
              masked={outPlot.map((p) => [p.x, p.y])}
              wells={inPlot}
              maskedWells={outPlot}
              fit={shownParts?.fit ?? null}
              fitLabel={preview ? "4PL fit (preview, not saved)" : "4PL fit"}
              reference={preview ? storedParts.fit : null}
              referenceLabel="stored fit"
              marks={{
                proposed: proposed.map(({ w }) => asPlot(w)),
                proposedLabel: proposalLabel,
                changedKeys: c.changedKeys,
                selectedKey: c.selected,
              }}
              onPointClick={mayEdit ? (k) => c.toggle(k) : (k) => c.setSelected(k)}
            />
          </div>
          <CurationPanel
            c={c}
            describe={describe}
            mayEdit={mayEdit}
            action={action}
            campaignId={campaignId}
            experimentId={experimentId}
            compoundId={compoundId}
          />
          {proposed.length ? (
            <div className="card p-3 text-sm" data-testid="outlier-proposals">
              <p className="mb-1 text-xs font-medium text-ink-muted">
                <span className="chip mr-1 bg-warn-soft text-warn">{proposalLabel}</span>
                robust fit; nothing is dropped until a person excludes it
              </p>
              <OutlierProposals
                proposed={proposed}
                describe={describe}
                residualNote="residual / robust SD, dimensionless"
                mayEdit={mayEdit}
                onExclude={(w) => c.toggle(w.key, proposalReason(qPct))}
              />
            </div>
          ) : null}
        </div>
        <div className="flex flex-col gap-3">
          <table className="table-dense card" data-testid="dose-response-figures">
            {preview ? (
              <thead>
                <tr>
                  <th />
                  <th className="text-right">Stored analysis</th>
                  <th className="bg-warn-soft/40 text-right">{previewLabel}</th>
                </tr>
              </thead>
            ) : null}
            <tbody>
              <Row label="Outcome" stored={sf.outcome} preview={previewCell("outcome")} />
              <Row label="IC50" stored={sf.ic50} preview={previewCell("ic50")} />
              <Row label="95 % CI (t on log10 IC50)" stored={sf.ci} preview={previewCell("ci")} />
              <Row label="Hill slope (dimensionless)" stored={sf.hill} preview={previewCell("hill")} />
              <Row label="Top / bottom (% inhibition)" stored={sf.plateaus} preview={previewCell("plateaus")} />
              <Row label="Maximum reached (% inhibition)" stored={sf.max} preview={previewCell("max")} />
              <Row label="R² (dimensionless)" stored={sf.r2} preview={previewCell("r2")} />
              <Row label="Lack-of-fit F (df), p" stored={sf.lof} preview={previewCell("lof")} />
              <Row label="Runs of residual signs (expected), p" stored={sf.runs} preview={previewCell("runs")} />
              <Row label="Adequacy (fails at p < 0.01)" stored={sf.verdict} preview={previewCell("verdict")} />
              <Row label="Weighting" stored={sf.weighting} preview={previewCell("weighting")} />
              <Row label="Proposed outliers (ROUT)" stored={sf.outliers} preview={previewCell("outliers")} />
              <Row label="Wells in the fit" stored={sf.wells} preview={previewCell("wells")} />
              <Row label="Tested range" stored={sf.range} preview={previewCell("range")} />
              <Row label="Flags" stored={sf.flags} preview={previewCell("flags")} />
            </tbody>
          </table>
          <FitNotes stored={storedParts} preview={preview?.view ? partsOf(preview.view.detail) : null} />
          <MorrisonNote parts={shownParts ?? storedParts} />
        </div>
      </div>
    </section>
  );
}

/** The sentences behind the table's short cells: why this weighting, why inadequate. */
function FitNotes({
  stored,
  preview,
}: {
  stored: ReturnType<typeof partsOf>;
  preview: ReturnType<typeof partsOf> | null;
}) {
  const line = (p: ReturnType<typeof partsOf>, which: string) => (
    <>
      {p.weighting ? (
        <li>
          Weighting{which}: <WeightingText w={p.weighting} />
        </li>
      ) : null}
      {p.adequacy && !p.adequacy.adequate ? (
        <li className="text-fail">
          Inadequate{which}: {p.adequacy.reasons.join("; ")}
        </li>
      ) : null}
    </>
  );
  return (
    <ul className="flex flex-col gap-1 text-2xs text-ink-soft">
      {line(stored, preview ? " (stored)" : "")}
      {preview ? line(preview, " (preview)") : null}
      <li className="text-ink-muted">
        Lack of fit: misfit against the scatter of replicate wells at the same dose (F-test, Draper &amp; Smith); runs:
        sign changes of the residuals ordered by dose (Wald–Wolfowitz). Both statistics are dimensionless; either p &lt;
        0.01 marks the curve inadequate.
      </li>
    </ul>
  );
}

function MorrisonNote({ parts }: { parts: ReturnType<typeof partsOf> }) {
  const m = parts.morrison;
  if (!m) return null;
  return (
    <div className="card p-3 text-sm">
      <p className="mb-1 font-semibold">Tight binding: Morrison fit</p>
      {"error" in m ? (
        <p className="text-fail">{m.error}</p>
      ) : (
        <p className="num text-ink-soft">
          K′ (apparent Ki) {formatConcentration(m.kAppUm)} (95 % CI {formatConcentration(m.kAppCi95Um[0])} –{" "}
          {formatConcentration(m.kAppCi95Um[1])}) at [E] = {formatConcentration(m.enzymeUm)}; IC50 = K′ + [E]/2 ={" "}
          {formatConcentration(m.ic50Um)}.
        </p>
      )}
    </div>
  );
}
