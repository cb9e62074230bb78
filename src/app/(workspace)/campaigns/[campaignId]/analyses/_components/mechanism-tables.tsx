import { INHIBITION_MODELS, type InhibitionModel } from "@/lib/kinetics/inhibition-models";
import type { AlternativeModel, MechanismFittedDetail } from "@/lib/analysis/detail";
import { formatConcentration } from "@/lib/units";
import { formatP } from "./figures";

const fixed = (x: number | null | undefined, digits: number) =>
  x === null || x === undefined ? "—" : x.toFixed(digits);
const precise = (x: number | null | undefined, digits: number) =>
  x === null || x === undefined ? "—" : x.toPrecision(digits);

/** The four standard models side by side, with each one's adequacy. */
export function ModelComparison({
  d,
  chosen,
  rateUnit,
  caption,
}: {
  d: MechanismFittedDetail;
  chosen: InhibitionModel;
  rateUnit: string;
  caption: string;
}) {
  return (
    <section>
      <h3 className="mb-2">{caption}</h3>
      <div className="overflow-x-auto">
        <table className="table-dense card">
          <thead>
            <tr>
              <th>Model</th>
              <th className="text-right">Vmax ({rateUnit})</th>
              <th className="text-right">Km</th>
              <th className="text-right">Kic</th>
              <th className="text-right">Kiu</th>
              <th className="text-right">RSS ({rateUnit})²</th>
              <th className="text-right">AICc</th>
              <th className="text-right">ΔAICc</th>
              <th className="text-right">Akaike weight</th>
              <th className="text-right">F-test p vs mixed</th>
              <th className="text-right">Lack-of-fit p</th>
              <th className="text-right">Runs p (runs / expected)</th>
            </tr>
          </thead>
          <tbody>
            {INHIBITION_MODELS.map((m) => {
              const s = d.models[m];
              const a = s.adequacy ?? null;
              const bad = a !== null && !a.adequate;
              return (
                <tr key={m} className={m === chosen ? "bg-accent-soft/50 font-medium" : ""}>
                  <td>
                    {m}
                    {m === d.best ? " (fitted choice)" : ""}
                    {bad ? <span className="chip ml-1 bg-fail-soft text-fail">inadequate</span> : null}
                  </td>
                  <td className="num text-right">{precise(s.vmax, 4)}</td>
                  <td className="num text-right">{formatConcentration(s.kmUm)}</td>
                  <td className="num text-right">{s.kicUm === null ? "—" : formatConcentration(s.kicUm)}</td>
                  <td className="num text-right">{s.kiuUm === null ? "—" : formatConcentration(s.kiuUm)}</td>
                  <td className="num text-right">{precise(s.rss, 4)}</td>
                  <td className="num text-right">{fixed(s.aicc, 2)}</td>
                  <td className="num text-right">{fixed(s.deltaAicc, 2)}</td>
                  <td className="num text-right">{fixed(s.akaikeWeight, 3)}</td>
                  <td className="num text-right">{formatP(s.fTestVsMixedP)}</td>
                  <td className="num text-right">
                    {a ? (a.lackOfFit ? formatP(a.lackOfFit.p) : "no replicates") : "—"}
                  </td>
                  <td className="num text-right">
                    {a ? `${formatP(a.runs.p)} (${a.runs.runs} / ${a.runs.expected.toFixed(1)})` : "—"}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <p className="mt-1 text-2xs text-ink-muted">
        Choice: lowest AICc (dimensionless); mixed only when the extra-sum-of-squares F-test against the best nested
        model gives p &lt; 0.05. &ldquo;Ambiguous&rdquo; when another model lies within ΔAICc 2;
        &ldquo;inadequate&rdquo; when the chosen model fails the lack-of-fit F-test or the runs test at p &lt; 0.01.
      </p>
    </section>
  );
}

const CONSTANT_NAMES: Record<string, string> = {
  vmax: "Vmax",
  km: "Km",
  kic: "Kic",
  kiu: "Kiu",
  ki: "Ki",
  ksi: "Ksi",
  beta: "β",
  alpha: "α",
};

/** "Kic 868 nM ± 36.6 nM (95 % CI 801 nM – 948 nM)": a constant with its SE and CI, in its unit. */
export function constantText(key: string, c: AlternativeModel["constants"][string], rateUnit: string): string {
  const unit = c.unit === "rate" ? rateUnit : c.unit;
  const v = (x: number | null) =>
    x === null ? "—" : unit === "µM" ? formatConcentration(x) : `${Number(x.toPrecision(3))}${unit ? ` ${unit}` : ""}`;
  const name = CONSTANT_NAMES[key.replace(/Um$/, "")] ?? key;
  if (c.fixed)
    return `${name} ${v(c.value)} (fixed by the model, not estimated)${unit === "" ? " (dimensionless)" : ""}`;
  return `${name} ${v(c.value)} ± ${c.se === null ? "—" : v(c.se)} (95 % CI ${v(c.ci95[0])} – ${c.ci95[1] === null ? "∞" : v(c.ci95[1])})${unit === "" ? " (dimensionless)" : ""}`;
}

function adequacyShort(a: AlternativeModel["adequacy"]) {
  if (a === null) return <span className="text-ink-faint">—</span>;
  if (a.adequate) return <span className="text-pass">adequate</span>;
  const parts = [
    a.lackOfFit && a.lackOfFit.p !== null && a.lackOfFit.p < 0.01 ? `lack of fit p ${formatP(a.lackOfFit.p)}` : null,
    a.runs.p !== null && a.runs.p < 0.01 ? `runs p ${formatP(a.runs.p)}` : null,
  ].filter(Boolean);
  return <span className="text-fail">inadequate: {parts.join("; ") || "see reasons"}</span>;
}

function AlternativeRow({ m, recommended, rateUnit }: { m: AlternativeModel; recommended: boolean; rateUnit: string }) {
  return (
    <tr className={recommended ? "bg-accent-soft/50" : ""}>
      <td className="font-medium">
        {m.name}
        {recommended ? <span className="chip ml-1 bg-accent-soft text-accent">recommended</span> : null}
        {!m.converged ? <span className="chip ml-1 bg-warn-soft text-warn">not converged</span> : null}
        {m.exclusion ? (
          <span className="chip ml-1 bg-paper-sunk text-ink-muted" title={m.exclusion}>
            not recommendable
          </span>
        ) : null}
      </td>
      <td className="num text-xs">
        {Object.entries(m.constants).map(([k, c]) => (
          <span key={k} className="block whitespace-nowrap">
            {constantText(k, c, rateUnit)}
          </span>
        ))}
      </td>
      <td className="num text-right">{fixed(m.deltaAicc, 2)}</td>
      <td className="text-xs">{adequacyShort(m.adequacy)}</td>
      <td className="text-xs text-ink-soft">{m.meaning}</td>
    </tr>
  );
}

/**
 * Models beyond the four, fitted because the data called for them, each with what it means: the
 * recommended one and the three closest by AICc in view, the rest a click away.
 */
export function AlternativeModels({
  alternatives,
  recommended,
  recommendedReason,
  rateUnit,
}: {
  alternatives: readonly AlternativeModel[];
  recommended: string | undefined;
  recommendedReason: string | undefined;
  rateUnit: string;
}) {
  if (alternatives.length === 0) return null;
  const ordered = [...alternatives].sort(
    (a, b) =>
      Number(b.model === recommended) - Number(a.model === recommended) ||
      (a.deltaAicc ?? Infinity) - (b.deltaAicc ?? Infinity),
  );
  const first = ordered.slice(0, 4);
  const rest = ordered.slice(4);
  const head = (
    <thead>
      <tr>
        <th>Model</th>
        <th>Constants (value ± SE, 95 % CI)</th>
        <th className="text-right">ΔAICc</th>
        <th>Adequacy</th>
        <th>What it means</th>
      </tr>
    </thead>
  );
  return (
    <section data-testid="alternative-models">
      <h3 className="mb-2">Models beyond the four standard ones ({alternatives.length} fitted)</h3>
      {recommendedReason ? <p className="mb-1 text-xs text-ink-soft">Recommendation: {recommendedReason}</p> : null}
      <div className="overflow-x-auto">
        <table className="table-dense card">
          {head}
          <tbody>
            {first.map((m) => (
              <AlternativeRow key={m.model} m={m} recommended={m.model === recommended} rateUnit={rateUnit} />
            ))}
          </tbody>
        </table>
      </div>
      {rest.length ? (
        <details className="mt-2">
          <summary className="cursor-pointer text-xs text-accent">
            {rest.length} more {rest.length === 1 ? "model" : "models"} tried (ΔAICc larger)
          </summary>
          <div className="mt-1 overflow-x-auto">
            <table className="table-dense card">
              {head}
              <tbody>
                {rest.map((m) => (
                  <AlternativeRow key={m.model} m={m} recommended={false} rateUnit={rateUnit} />
                ))}
              </tbody>
            </table>
          </div>
        </details>
      ) : null}
      <p className="mt-1 text-2xs text-ink-muted">
        ΔAICc is against the lowest AICc of all models fitted, standard and beyond (dimensionless). A model is
        recommended only when it is adequate; a simpler nested model is kept unless the F-test rejects it. A model
        beyond the four also needs its extra term (β, Ksi, or Kiu of partial competitive inhibition) determined — a
        finite 95 % CI that excludes the value at which it reduces to a standard model — and the F-test preferring it to
        that standard model.
      </p>
    </section>
  );
}
