import Link from "next/link";
import { notFound } from "next/navigation";
import { pageCampaign } from "@/server/auth/page-guard";
import { AppError } from "@/server/errors";
import {
  chosenModel,
  compoundResultDetail,
  getAnalysis,
  getExperiment,
  maskedPoints,
  type ExperimentResult,
} from "@/server/services/analyses";
import { can } from "@/lib/roles";
import { campaignKmUm, formatConcentration, formatConcentrationRange } from "@/lib/units";
import { INHIBITION_MODELS } from "@/lib/kinetics/inhibition-models";
import { isFittedDoseResponse, isFittedMechanism } from "@/lib/analysis/detail";
import { headlineKi } from "@/lib/analysis/headline-ki";
import { DoseResponsePlot } from "@/components/plots/dose-response-plot";
import { RateVsSubstratePlot, DoubleReciprocalPlot, ResidualPlot } from "@/components/plots/mechanism-plots";
import { Flags, kindLabel } from "../../_components/labels";
import { OverrideForm, PlannerForm } from "../../_components/result-forms";
import { overrideMechanismAction, planMechanismPlateAction } from "../../actions";
import { formatAlpha } from "@/lib/analysis/alpha";

export const metadata = { title: "Compound result" };

const fixed = (x: number | null, digits: number) => (x === null ? "—" : x.toFixed(digits));
const precise = (x: number | null, digits: number) => (x === null ? "—" : x.toPrecision(digits));

export default async function CompoundResultPage({
  params,
}: {
  params: Promise<{ campaignId: string; experimentId: string; compoundId: string }>;
}) {
  const { campaignId, experimentId, compoundId } = await params;
  const { user, role, campaign } = await pageCampaign(campaignId);
  const notFoundOnApp = (e: unknown) => {
    if (e instanceof AppError) notFound();
    throw e;
  };
  const experiment = await getExperiment(campaignId, experimentId).catch(notFoundOnApp);
  const r = await compoundResultDetail(experimentId, decodeURIComponent(compoundId)).catch(notFoundOnApp);
  const current = await getAnalysis(campaignId, r.analysisId).catch(notFoundOnApp);
  const masked = r.kind === "dose-response" ? await maskedPoints(current.inputs, r.compoundId) : [];
  const base = `/campaigns/${campaignId}/analyses/${experimentId}`;
  const kmUm = campaignKmUm(campaign);

  return (
    <div className="flex flex-col gap-5">
      <div>
        <p className="text-xs text-ink-muted">
          <Link href={`/campaigns/${campaignId}/analyses`}>Analyses</Link> / <Link href={base}>{experiment.name}</Link>{" "}
          / {kindLabel[experiment.kind]}
        </p>
        <h1>{r.compoundId}</h1>
        <div className="mt-1">
          <Flags flags={r.flags} />
        </div>
      </div>
      {r.kind === "dose-response" ? <DoseResponseSection r={r} masked={masked} /> : null}
      {r.kind === "mechanism" ? <MechanismSection r={r} /> : null}
      {r.kind === "mechanism" && can(user.globalRole, role, "analysis:override") ? (
        <section>
          <h3 className="mb-2">Override the model choice</h3>
          <OverrideForm
            action={overrideMechanismAction}
            campaignId={campaignId}
            experimentId={experimentId}
            compoundId={r.compoundId}
            current={r.override?.model ?? r.mechanism ?? "competitive"}
          />
        </section>
      ) : null}
      {r.kind === "dose-response" && r.ic50Um && !r.ic50Qualifier && can(user.globalRole, role, "plate:write") ? (
        <section>
          <h3 className="mb-2">Plan a mechanism study</h3>
          <PlannerForm
            action={planMechanismPlateAction}
            campaignId={campaignId}
            compoundId={r.compoundId}
            ic50Um={r.ic50Um}
            kmUm={kmUm}
            assaySubstrateUm={(experiment.settings.substrateUm ?? kmUm) || null}
          />
        </section>
      ) : null}
      <p className="text-2xs text-ink-muted">
        Analysis {r.analysisId.slice(0, 8)} · engine {current.engineVersion} · input hash{" "}
        {current.inputHash.slice(0, 16)}… · {current.inputs.runs.length} accepted runs · {current.inputs.masks.length}{" "}
        masked wells
      </p>
    </div>
  );
}

type Result<K extends ExperimentResult["kind"]> = Extract<ExperimentResult, { kind: K }>;

function DoseResponseSection({ r, masked }: { r: Result<"dose-response">; masked: [number, number][] }) {
  const d = isFittedDoseResponse(r.detail) ? r.detail : null;
  const morrison = d?.morrison ?? null;
  return (
    <section className="grid gap-4 lg:grid-cols-[2fr_1fr]">
      <div className="card p-2">
        <DoseResponsePlot points={r.detail.points.map((p) => [p[0], p[1]])} masked={masked} fit={d?.fit ?? null} />
      </div>
      <div className="flex flex-col gap-3">
        <table className="table-dense card">
          <tbody>
            <tr>
              <td className="text-ink-muted">IC50</td>
              <td className="num text-right font-semibold">
                {r.ic50Qualifier ?? ""}
                {formatConcentration(r.ic50Um)}
              </td>
            </tr>
            <tr>
              <td className="text-ink-muted">95 % CI (t on log10 IC50)</td>
              <td className="num text-right">{formatConcentrationRange(r.ic50LoUm, r.ic50HiUm)}</td>
            </tr>
            <tr>
              <td className="text-ink-muted">Hill slope (dimensionless)</td>
              <td className="num text-right">{r.hill === null ? "—" : r.hill.toFixed(2)}</td>
            </tr>
            <tr>
              <td className="text-ink-muted">Top / bottom (% inhibition)</td>
              <td className="num text-right">
                {d?.fit.topPct?.toFixed(1) ?? "—"} / {d?.fit.bottomPct?.toFixed(1) ?? "—"}
              </td>
            </tr>
            <tr>
              <td className="text-ink-muted">R²</td>
              <td className="num text-right">{d?.fit.rSquared?.toFixed(3) ?? "—"}</td>
            </tr>
            <tr>
              <td className="text-ink-muted">Tested range</td>
              <td className="num text-right">
                {formatConcentration(d?.testedRangeUm[0])} – {formatConcentration(d?.testedRangeUm[1])}
              </td>
            </tr>
            <tr>
              <td className="text-ink-muted">Wells in the fit</td>
              <td className="num text-right">{r.nPoints}</td>
            </tr>
          </tbody>
        </table>
        {morrison ? (
          <div className="card p-3 text-sm">
            <p className="mb-1 font-semibold">Tight binding: Morrison fit</p>
            {"error" in morrison ? (
              <p className="text-fail">{morrison.error}</p>
            ) : (
              <p className="num text-ink-soft">
                K′ (apparent Ki) {formatConcentration(morrison.kAppUm)} (95 % CI{" "}
                {formatConcentration(morrison.kAppCi95Um[0])} – {formatConcentration(morrison.kAppCi95Um[1])}) at [E] ={" "}
                {formatConcentration(morrison.enzymeUm)}; IC50 = K′ + [E]/2 = {formatConcentration(morrison.ic50Um)}.
              </p>
            )}
          </div>
        ) : null}
      </div>
    </section>
  );
}

function MechanismSection({ r }: { r: Result<"mechanism"> }) {
  const d = r.detail;
  if (!isFittedMechanism(d)) {
    return (
      <section className="card px-4 py-3 text-sm">
        <p className="text-xs font-medium text-ink-muted">No mechanism fit</p>
        <p>{"reason" in d ? d.reason : d.error}</p>
      </section>
    );
  }
  const chosen = chosenModel(r) ?? d.best;
  const fit = d.models[chosen];
  const headline = headlineKi(chosen, fit);
  const pts = d.points.flatMap((p): [number, number, number][] => (p[2] === null ? [] : [[p[0], p[1], p[2]]]));
  const unit = "signal/s";
  const cp = d.chengPrusoff;
  return (
    <>
      <section className="card flex flex-wrap gap-6 px-4 py-3 text-sm">
        <div>
          <p className="text-xs font-medium text-ink-muted">Mechanism</p>
          <p className="text-lg font-semibold">
            {chosen} {r.override ? <span className="chip bg-info-soft text-info">override</span> : null}{" "}
            {!r.override && r.mechanismLabel === "ambiguous" ? (
              <span className="chip bg-warn-soft text-warn">ambiguous</span>
            ) : null}
          </p>
          {r.override ? (
            <p className="text-xs text-ink-muted">
              Fitted choice: {r.mechanism}. Override reason: {r.override.reason}
            </p>
          ) : null}
        </div>
        <div>
          <p className="text-xs font-medium text-ink-muted">Ki</p>
          <p className="num text-lg font-semibold">{formatConcentration(headline.kiUm)}</p>
          <p className="num text-xs text-ink-muted">95 % CI {formatConcentrationRange(...headline.ci95)}</p>
        </div>
        <div>
          <p className="text-xs font-medium text-ink-muted">α = Kiu/Kic</p>
          <p className="num text-lg font-semibold">{formatAlpha(fit.alpha, chosen)}</p>
        </div>
        <div>
          <p className="text-xs font-medium text-ink-muted">Vmax · Km</p>
          <p className="num">
            {fit.vmax?.toPrecision(4)} {unit} · {formatConcentration(fit.kmUm)}
          </p>
        </div>
        {cp ? (
          <div className="max-w-sm">
            <p className="text-xs font-medium text-ink-muted">Cheng–Prusoff cross-check</p>
            {"note" in cp ? (
              <p className="text-xs text-ink-muted">{cp.note}</p>
            ) : (
              <p className="num text-xs">
                predicted IC50 {formatConcentration(cp.predictedIc50Um)} at [S] {formatConcentration(cp.substrateUm)} vs
                measured {formatConcentration(cp.measuredIc50Um)} (ratio {cp.ratio.toPrecision(3)})
              </p>
            )}
          </div>
        ) : null}
      </section>
      <section className="grid gap-4 xl:grid-cols-2">
        <div className="card p-2">
          <RateVsSubstratePlot points={pts} model={chosen} fit={fit} rateUnit={unit} />
        </div>
        <div className="card p-2">
          <DoubleReciprocalPlot points={pts} model={chosen} fit={fit} rateUnit={unit} />
        </div>
        <div className="card p-2 xl:col-span-2">
          <ResidualPlot points={pts} model={chosen} fit={fit} rateUnit={unit} />
        </div>
      </section>
      <section>
        <h3 className="mb-2">Model comparison (global fits, {d.points.length} wells)</h3>
        <table className="table-dense card">
          <thead>
            <tr>
              <th>Model</th>
              <th className="text-right">Vmax ({unit})</th>
              <th className="text-right">Km</th>
              <th className="text-right">Kic</th>
              <th className="text-right">Kiu</th>
              <th className="text-right">RSS</th>
              <th className="text-right">AICc</th>
              <th className="text-right">ΔAICc</th>
              <th className="text-right">Akaike weight</th>
              <th className="text-right">F-test p vs mixed</th>
            </tr>
          </thead>
          <tbody>
            {INHIBITION_MODELS.map((m) => {
              const s = d.models[m];
              return (
                <tr key={m} className={m === chosen ? "bg-accent-soft/50 font-medium" : ""}>
                  <td>
                    {m}
                    {m === d.best ? " (fitted choice)" : ""}
                  </td>
                  <td className="num text-right">{s.vmax?.toPrecision(4) ?? "—"}</td>
                  <td className="num text-right">{formatConcentration(s.kmUm)}</td>
                  <td className="num text-right">{s.kicUm === null ? "—" : formatConcentration(s.kicUm)}</td>
                  <td className="num text-right">{s.kiuUm === null ? "—" : formatConcentration(s.kiuUm)}</td>
                  <td className="num text-right">{precise(s.rss, 4)}</td>
                  <td className="num text-right">{fixed(s.aicc, 2)}</td>
                  <td className="num text-right">{fixed(s.deltaAicc, 2)}</td>
                  <td className="num text-right">{fixed(s.akaikeWeight, 3)}</td>
                  <td className="num text-right">{precise(s.fTestVsMixedP, 3)}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
        <p className="mt-1 text-2xs text-ink-muted">
          Choice: lowest AICc; mixed only when the extra-sum-of-squares F-test against the best nested model gives p
          &lt; 0.05. &ldquo;Ambiguous&rdquo; when another model lies within ΔAICc 2.
        </p>
      </section>
    </>
  );
}
