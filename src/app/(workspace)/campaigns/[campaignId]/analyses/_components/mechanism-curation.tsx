"use client";
import { useMemo } from "react";
import type { ActionState } from "@/server/action";
import { analyseMechanismCompound } from "@/lib/analysis/compute";
import { isFittedMechanism, parseResultDetail, type MechanismDetail } from "@/lib/analysis/detail";
import { headlineKi } from "@/lib/analysis/headline-ki";
import { formatAlpha } from "@/lib/analysis/alpha";
import type { InhibitionModel } from "@/lib/kinetics/inhibition-models";
import { formatConcentration, formatConcentrationRange } from "@/lib/units";
import { DoubleReciprocalPlot, RateVsSubstratePlot, ResidualPlot } from "@/components/plots/mechanism-plots";
import type { PlotWell } from "@/components/plots/marks";
import { CurationPanel, OutlierProposals, proposalReason, useCuration, type CurationWell } from "./curation";
import { AdequacyVerdict, LackOfFitText, RunsText, WeightingText, qText } from "./figures";
import { OUTLIER_Q } from "@/lib/analysis/settings";
import { Flags } from "./labels";
import { AlternativeModels, ModelComparison, constantText } from "./mechanism-tables";

export type MechanismWell = CurationWell & { substrateUm: number; inhibitorUm: number; rate: number };

type Options = Parameters<typeof analyseMechanismCompound>[2];

const RATE_UNIT = "signal/s";

/** A mechanism result's headline, for the stored analysis or a preview. */
function Headline({
  d,
  chosen,
  flags,
  title,
  override,
  showFlags = true,
}: {
  d: MechanismDetail;
  chosen: InhibitionModel | null;
  flags: string[];
  title: string;
  override?: { model: string; reason: string } | null;
  /** The page's header shows the stored result's flags already. */
  showFlags?: boolean;
}) {
  if (!isFittedMechanism(d) || !chosen)
    return (
      <div className="text-sm">
        <p className="text-xs font-medium text-ink-muted">{title}</p>
        <p>No mechanism fit: {"reason" in d ? d.reason : "error" in d ? d.error : "—"}</p>
      </div>
    );
  const fit = d.models[chosen];
  const ki = headlineKi(chosen, fit);
  const recommended = d.recommended ? d.alternatives?.find((a) => a.model === d.recommended) : undefined;
  return (
    <div className="flex flex-wrap gap-6 text-sm">
      <div className="max-w-xs">
        <p className="text-xs font-medium text-ink-muted">{title}</p>
        <p className="text-lg font-semibold">
          {chosen} {override ? <span className="chip bg-info-soft text-info">override</span> : null}{" "}
          {!override && d.label === "ambiguous" ? <span className="chip bg-warn-soft text-warn">ambiguous</span> : null}
          {d.label === "inadequate" ? <span className="chip bg-fail-soft text-fail">inadequate</span> : null}
          {!override && d.label === "clear" ? <span className="chip bg-pass-soft text-pass">clear</span> : null}
        </p>
        {override ? (
          <p className="text-xs text-ink-muted">
            Fitted choice: {d.best}. Override reason: {override.reason}
          </p>
        ) : null}
      </div>
      <div>
        <p className="text-xs font-medium text-ink-muted">Ki</p>
        <p className="num text-lg font-semibold">{formatConcentration(ki.kiUm)}</p>
        <p className="num text-xs text-ink-muted">95 % CI {formatConcentrationRange(...ki.ci95)}</p>
      </div>
      <div>
        <p className="text-xs font-medium text-ink-muted">α = Kiu/Kic (dimensionless)</p>
        <p className="num text-lg font-semibold">{formatAlpha(fit.alpha, chosen)}</p>
      </div>
      <div>
        <p className="text-xs font-medium text-ink-muted">Vmax · Km</p>
        <p className="num">
          {fit.vmax === null ? "—" : `${fit.vmax.toPrecision(4)} ${RATE_UNIT}`} · {formatConcentration(fit.kmUm)}
        </p>
      </div>
      <div className="max-w-md">
        <p className="text-xs font-medium text-ink-muted">Adequacy of the {chosen} fit</p>
        <p className="num text-xs">
          Lack of fit: <LackOfFitText a={fit.adequacy} />
        </p>
        <p className="num text-xs">
          Runs (by [S] within each [I]): <RunsText a={fit.adequacy} />
        </p>
        <p className="text-xs">
          <AdequacyVerdict a={fit.adequacy} />
        </p>
      </div>
      <div className="max-w-sm">
        <p className="text-xs font-medium text-ink-muted">Weighting</p>
        <p className="text-xs">
          <WeightingText w={d.weightingDecision} fallback={d.weighting} />
        </p>
        {d.enzymeUm ? (
          <p className="text-xs text-ink-muted">
            [E] {formatConcentration(d.enzymeUm)} used for the tight-binding check
          </p>
        ) : null}
      </div>
      {recommended ? (
        <div className="max-w-md">
          <p className="text-xs font-medium text-ink-muted">Recommended model</p>
          <p className="text-sm font-medium">{recommended.name}</p>
          {Object.entries(recommended.constants).map(([k, c]) => (
            <p key={k} className="num text-xs">
              {constantText(k, c, RATE_UNIT)}
            </p>
          ))}
        </div>
      ) : null}
      {d.labelReasons?.length ? (
        <div className="w-full">
          <p className="text-xs font-medium text-ink-muted">
            {d.label === "inadequate" ? "Why the call is “inadequate”" : "Why the call is not clear"}
          </p>
          <ul className="list-disc pl-5 text-xs text-ink-soft marker:text-fail">
            {d.labelReasons.map((t) => (
              <li key={t}>{t}</li>
            ))}
          </ul>
          {d.recommendedReason ? <p className="text-xs text-ink-muted">Recommendation: {d.recommendedReason}</p> : null}
        </div>
      ) : null}
      {showFlags ? (
        <div className="w-full">
          <Flags flags={flags} />
        </div>
      ) : null}
    </div>
  );
}

/**
 * The mechanism result with curation: click a point of the rate-vs-[S] plot to leave it out of
 * the global fit or put it back; while wells differ from the stored analysis, the browser refits
 * the models with the pipeline's own function and shows that preview beside the stored result.
 */
export function MechanismCuration({
  campaignId,
  experimentId,
  compoundId,
  wells,
  stored,
  override,
  options,
  mayEdit,
  action,
}: {
  campaignId: string;
  experimentId: string;
  compoundId: string;
  wells: MechanismWell[];
  stored: { detail: MechanismDetail; chosen: InhibitionModel | null; flags: string[] };
  override: { model: InhibitionModel; reason: string } | null;
  options: Options;
  mayEdit: boolean;
  action: (prev: ActionState, form: FormData) => Promise<ActionState>;
}) {
  const c = useCuration(wells);
  const preview = useMemo(() => {
    if (!c.differs) return null;
    if (c.included.length === 0) return { error: "No wells left in the fit." } as const;
    // The pipeline's order (run, then well), so the residuals' order and the fit are the same.
    const pts = [...c.included]
      .sort((a, b) => (a.runId === b.runId ? a.well.localeCompare(b.well) : a.runId.localeCompare(b.runId)))
      .map((w) => ({ substrate: w.substrateUm, inhibitor: w.inhibitorUm, rate: w.rate, runId: w.runId, well: w.well }));
    try {
      const r = analyseMechanismCompound(compoundId, pts, options);
      const detail = parseResultDetail("mechanism", r.detail);
      return { detail, chosen: isFittedMechanism(detail) ? detail.best : null, flags: r.flags } as const;
    } catch (e) {
      return { error: e instanceof Error ? e.message : String(e) } as const;
    }
  }, [c.differs, c.included, compoundId, options]);
  const shown = preview ? ("error" in preview ? null : preview) : stored;
  const shownFit = shown && isFittedMechanism(shown.detail) && shown.chosen ? shown.detail : null;
  const storedFit = isFittedMechanism(stored.detail) && stored.chosen ? stored.detail : null;
  const asPlot = (w: MechanismWell): PlotWell & { i: number } => ({
    key: w.key,
    x: w.substrateUm,
    y: w.rate,
    i: w.inhibitorUm,
    label: `${w.well} · ${w.runLabel} · [I] ${formatConcentration(w.inhibitorUm)}${w.savedMasked && w.reason ? ` · masked: ${w.reason}` : ""}`,
  });
  const describe = (w: MechanismWell) =>
    `${w.well} · ${w.runLabel} · [S] ${formatConcentration(w.substrateUm)} · [I] ${formatConcentration(w.inhibitorUm)} · ${w.rate.toPrecision(4)} ${RATE_UNIT}`;
  const inPlot = c.included.map(asPlot);
  const pts = c.included.map((w): [number, number, number] => [w.substrateUm, w.inhibitorUm, w.rate]);
  const proposedAll = shownFit?.outliers?.proposed ?? [];
  const proposed = proposedAll.flatMap((o) => {
    const w = c.byKey.get(`${o.runId}|${o.well}`);
    return w && !c.isOut(w) ? [{ w, o }] : [];
  });
  const qPct = qText(shownFit?.outliers?.q ?? OUTLIER_Q);
  const proposalLabel = `proposed: outlier (ROUT, Q = ${qPct} %)`;
  const unsaved = c.edits.size > 0;
  const previewLabel = unsaved ? "Preview, not saved" : "Saved masks, not yet analysed";
  const chosen = shown?.chosen ?? null;
  const plotFit = shownFit && chosen ? shownFit.models[chosen] : null;
  return (
    <>
      <section className="card flex flex-col gap-3 px-4 py-3" aria-label="Mechanism result">
        <Headline
          d={stored.detail}
          chosen={stored.chosen}
          flags={stored.flags}
          title="Mechanism (stored analysis)"
          override={override}
          showFlags={false}
        />
        {preview ? (
          <div className="rounded border border-warn/40 bg-warn-soft/50 px-3 py-2" role="status">
            <p className="mb-1 text-sm">
              <b className="font-semibold text-warn">{previewLabel}.</b>{" "}
              {unsaved
                ? "Refitted here in the browser on the wells now in the fit; nothing is stored until you save and run the analysis again."
                : "These wells are masked on their runs, but the stored result was computed before: run the analysis again."}
            </p>
            {"error" in preview ? (
              <p className="text-sm text-fail">The preview fit failed: {preview.error}</p>
            ) : (
              <Headline d={preview.detail} chosen={preview.chosen} flags={preview.flags} title={previewLabel} />
            )}
          </div>
        ) : null}
      </section>
      <section className="grid gap-4 xl:grid-cols-2">
        <div className="flex flex-col gap-2">
          <div className="card p-2" data-testid="rate-plot">
            {plotFit && chosen ? (
              <RateVsSubstratePlot
                points={pts}
                wells={inPlot}
                masked={c.excluded.map(asPlot)}
                model={chosen}
                fit={plotFit}
                rateUnit={RATE_UNIT}
                title={`Rate vs [S], ${chosen} fit${preview ? " (preview, not saved)" : ""}`}
                reference={
                  preview && storedFit && stored.chosen
                    ? { model: stored.chosen, fit: storedFit.models[stored.chosen], label: "stored fit" }
                    : null
                }
                marks={{
                  proposed: proposed.map(({ w }) => asPlot(w)),
                  proposedLabel: proposalLabel,
                  changedKeys: c.changedKeys,
                  selectedKey: c.selected,
                }}
                onPointClick={mayEdit ? (k) => c.toggle(k) : (k) => c.setSelected(k)}
              />
            ) : (
              <p className="p-4 text-sm text-ink-muted">No fitted curve to draw.</p>
            )}
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
                robust fit of the {shownFit?.outliers?.model ?? "chosen"} model; nothing is dropped until a person
                excludes it
                {shownFit?.outliers?.callWithout ? (
                  <span className="block">
                    Without them the call would be {shownFit.outliers.callWithout}
                    {shownFit.outliers.kiWithoutUm !== null
                      ? `, Ki ${formatConcentration(shownFit.outliers.kiWithoutUm)}`
                      : ""}
                    .
                  </span>
                ) : null}
              </p>
              <OutlierProposals
                proposed={proposed}
                describe={describe}
                residualNote="dimensionless"
                mayEdit={mayEdit}
                onExclude={(w) => c.toggle(w.key, proposalReason(qPct))}
              />
            </div>
          ) : null}
        </div>
        {plotFit && chosen ? (
          <div className="card p-2">
            <DoubleReciprocalPlot points={pts} model={chosen} fit={plotFit} rateUnit={RATE_UNIT} />
          </div>
        ) : null}
        {plotFit && chosen ? (
          <div className="card p-2 xl:col-span-2">
            <ResidualPlot points={pts} model={chosen} fit={plotFit} rateUnit={RATE_UNIT} />
          </div>
        ) : null}
      </section>
      {shownFit && chosen ? (
        <>
          <ModelComparison
            d={shownFit}
            chosen={chosen}
            rateUnit={RATE_UNIT}
            caption={`Model comparison (global fits, ${shownFit.points.length} wells${preview ? "; preview, not saved" : ""})`}
          />
          <AlternativeModels
            alternatives={shownFit.alternatives ?? []}
            recommended={shownFit.recommended}
            recommendedReason={shownFit.recommendedReason}
            rateUnit={RATE_UNIT}
          />
        </>
      ) : null}
    </>
  );
}
