"use client";
import { useActionState, useMemo, useState } from "react";
import { PlateHeatmap, type HeatmapWell } from "@/components/plots/plate-heatmap";
import { Plot, baseConfig, baseLayout } from "@/components/plots/plot";
import { FormMessage } from "@/components/forms/form-bits";
import { maskWellAction, unmaskWellAction } from "../actions";
import { fmtNum, fmtSig } from "./status";
import { canonicalWell } from "@/lib/plates/geometry";

export type RunWell = {
  index: number;
  well: string;
  role: HeatmapWell["role"];
  compound: string | null;
  concentrationUm: number | null;
  substrateUm: number | null;
  value: number | null;
  rate: number | null;
  rSquared: number | null;
  linear: boolean | null;
  windowS: [number, number] | null;
  series: { timesS: number[]; values: number[] } | null;
  signal: number | null;
  inhibitionPct: number | null;
  masked: boolean;
};

const roleWords: Record<HeatmapWell["role"], string> = {
  sample: "sample",
  neutral: "neutral control",
  full: "full-inhibition control",
  blank: "blank",
  empty: "empty (not in the plate map)",
};

// A diverging scale for % inhibition: 0 % pale, 100 % deep teal, negative values warm.
const inhibitionScale: [number, string][] = [
  [0, "#a16207"],
  [0.2, "#fbf1de"],
  [0.25, "#f7f7f4"],
  [0.6, "#7cc4b5"],
  [1, "#0b4f4a"],
];

/** Heatmaps of the raw signal and % inhibition, a well inspector, and masking with a reason. */
export function RunView({
  campaignId,
  runId,
  rows,
  columns,
  readout,
  wells,
  openMasks,
  canWrite,
}: {
  campaignId: string;
  runId: string;
  rows: number;
  columns: number;
  readout: "endpoint" | "kinetic";
  wells: RunWell[];
  openMasks: Record<string, string>;
  canWrite: boolean;
}) {
  const [selected, setSelected] = useState<string | null>(null);
  const [goError, setGoError] = useState<string | null>(null);
  const byName = useMemo(() => new Map(wells.map((w) => [w.well, w])), [wells]);
  const label = (w: RunWell) =>
    w.compound ? `${w.compound}${w.concentrationUm !== null ? ` @ ${w.concentrationUm} µM` : ""}` : "";
  const signalUnit = readout === "kinetic" ? "signal/s" : "signal";
  const raw = useMemo<HeatmapWell[]>(
    () =>
      wells.map((w) => ({
        index: w.index,
        well: w.well,
        role: w.role,
        value: w.signal,
        masked: w.masked,
        label: label(w),
      })),
    [wells],
  );
  const inh = useMemo<HeatmapWell[]>(
    () =>
      wells.map((w) => ({
        index: w.index,
        well: w.well,
        role: w.role,
        value: w.inhibitionPct === null ? null : Math.max(-50, Math.min(150, w.inhibitionPct)),
        masked: w.masked,
        label: label(w),
      })),
    [wells],
  );
  const sel = selected ? byName.get(selected) : undefined;
  const controlS = new Set(wells.filter((w) => w.role === "neutral" || w.role === "full").map((w) => w.substrateUm));
  const mixedSubstrate = wells.some(
    (w) => w.role === "sample" && w.substrateUm !== null && !controlS.has(w.substrateUm),
  );
  const height = rows > 16 ? 420 : rows > 8 ? 330 : 260;
  return (
    <div className="flex min-w-0 flex-col gap-3">
      <p className="text-xs text-ink-muted">
        Click a well to inspect it{canWrite ? " or mask it" : ""}. Dark rings mark neutral controls, white squares
        full-inhibition controls, red crosses masked wells.
      </p>
      {mixedSubstrate ? (
        <p className="rounded border border-info/30 bg-info-soft px-2 py-1 text-xs text-ink-soft">
          Samples on this plate run at substrate concentrations other than the controls&rsquo; (a mechanism study), so
          their % inhibition against the controls is not a measure of potency; the mechanism analysis uses the initial
          rates against [S] and [I].
        </p>
      ) : null}
      <div className="grid gap-3 2xl:grid-cols-2">
        <div className="card px-2 pt-1" data-testid="heatmap-raw">
          <PlateHeatmap
            rows={rows}
            columns={columns}
            wells={raw}
            title={readout === "kinetic" ? "Initial rate (signal units/s)" : "Raw signal (signal units)"}
            unit={signalUnit}
            selected={selected}
            onSelect={setSelected}
            height={height}
          />
        </div>
        <div className="card px-2 pt-1" data-testid="heatmap-inhibition">
          <PlateHeatmap
            rows={rows}
            columns={columns}
            wells={inh}
            title="Inhibition (%), against this run's controls"
            unit="%"
            colorscale={inhibitionScale}
            zmin={-50}
            zmax={150}
            selected={selected}
            onSelect={setSelected}
            height={height}
          />
        </div>
      </div>
      <form
        className="flex items-center gap-2 text-xs"
        onSubmit={(e) => {
          e.preventDefault();
          const typed = String(new FormData(e.currentTarget).get("go") ?? "")
            .trim()
            .toUpperCase();
          const v = canonicalWell(typed) ?? typed;
          setSelected(byName.has(v) ? v : null);
          setGoError(byName.has(v) ? null : `${v.slice(0, 6) || "That"} is not a well read on this plate.`);
        }}
      >
        <label htmlFor="go-well" className="text-ink-muted">
          Well
        </label>
        <input id="go-well" name="go" className="input w-20 py-0.5 font-mono" placeholder="B3" maxLength={6} />
        <button className="btn-quiet py-0.5">Inspect</button>
        {goError ? <span className="text-fail">{goError}</span> : null}
      </form>
      <section className="card px-3 py-2" aria-label="Well inspector">
        {sel ? (
          <WellInspector
            key={sel.well}
            w={sel}
            readout={readout}
            campaignId={campaignId}
            runId={runId}
            maskReason={openMasks[sel.well]}
            canWrite={canWrite}
          />
        ) : (
          <p className="text-sm text-ink-muted">No well selected.</p>
        )}
      </section>
    </div>
  );
}

function WellInspector({
  w,
  readout,
  campaignId,
  runId,
  maskReason,
  canWrite,
}: {
  w: RunWell;
  readout: "endpoint" | "kinetic";
  campaignId: string;
  runId: string;
  maskReason?: string;
  canWrite: boolean;
}) {
  const [state, action, pending] = useActionState(w.masked ? unmaskWellAction : maskWellAction, null);
  return (
    <div className="grid gap-3 md:grid-cols-2">
      <div>
        <h3 className="mb-1">
          Well <span className="font-mono normal-case text-ink">{w.well}</span>
          {w.masked ? <span className="chip ml-2 bg-fail-soft text-fail normal-case">masked</span> : null}
        </h3>
        <table className="table-dense">
          <tbody>
            <tr>
              <td className="text-ink-soft">Role</td>
              <td>{roleWords[w.role]}</td>
            </tr>
            {w.compound ? (
              <tr>
                <td className="text-ink-soft">Compound</td>
                <td className="font-mono">{w.compound}</td>
              </tr>
            ) : null}
            {w.concentrationUm !== null ? (
              <tr>
                <td className="text-ink-soft">Inhibitor</td>
                <td className="num">{fmtSig(w.concentrationUm)} µM</td>
              </tr>
            ) : null}
            {w.substrateUm !== null ? (
              <tr>
                <td className="text-ink-soft">Substrate</td>
                <td className="num">{fmtSig(w.substrateUm)} µM</td>
              </tr>
            ) : null}
            {readout === "endpoint" ? (
              <tr>
                <td className="text-ink-soft">Signal</td>
                <td className="num">{fmtSig(w.value, 6)} signal units</td>
              </tr>
            ) : (
              <>
                <tr>
                  <td className="text-ink-soft">Initial rate</td>
                  <td className="num">{fmtSig(w.rate)} signal units/s</td>
                </tr>
                <tr>
                  <td className="text-ink-soft">R² of the rate window</td>
                  <td className="num">{fmtNum(w.rSquared, 4)}</td>
                </tr>
                <tr>
                  <td className="text-ink-soft">Progress curve</td>
                  <td>{w.linear === null ? "—" : w.linear ? "linear" : "curved: early window used"}</td>
                </tr>
              </>
            )}
            <tr>
              <td className="text-ink-soft">Inhibition</td>
              <td className="num">{w.inhibitionPct === null ? "not normalised" : `${fmtNum(w.inhibitionPct, 1)} %`}</td>
            </tr>
            {maskReason ? (
              <tr>
                <td className="text-ink-soft">Masked because</td>
                <td>{maskReason}</td>
              </tr>
            ) : null}
          </tbody>
        </table>
        {canWrite ? (
          <form action={action} className="mt-2 flex flex-col gap-1.5">
            <input type="hidden" name="campaignId" value={campaignId} />
            <input type="hidden" name="runId" value={runId} />
            <input type="hidden" name="well" value={w.well} />
            <label className="field-label" htmlFor="mask-reason">
              {w.masked ? "Reason to unmask" : "Reason to mask"}
            </label>
            <input
              id="mask-reason"
              name="reason"
              className="input"
              required
              minLength={3}
              maxLength={500}
              placeholder={w.masked ? "e.g. re-checked: reading is valid" : "e.g. bubble seen at dispensing"}
            />
            <div>
              <button className={w.masked ? "btn-quiet" : "btn-danger"} disabled={pending}>
                {w.masked ? `Unmask ${w.well}` : `Mask ${w.well}`}
              </button>
            </div>
            <FormMessage state={state} />
          </form>
        ) : null}
      </div>
      {w.series ? <ProgressCurve w={w} /> : null}
    </div>
  );
}

function ProgressCurve({ w }: { w: RunWell }) {
  const s = w.series!;
  const win = w.windowS;
  const inWin = s.timesS.map((t) => (win ? t >= win[0] && t <= win[1] : false));
  return (
    <Plot
      data={[
        {
          type: "scatter",
          mode: "markers",
          name: "reads",
          x: s.timesS,
          y: s.values,
          marker: { size: 5, color: inWin.map((b) => (b ? "#0f766e" : "#98a2ab")) },
        },
        ...(win && w.rate !== null
          ? [
              {
                type: "scatter" as const,
                mode: "lines" as const,
                name: "initial-rate window",
                x: [win[0], win[1]],
                y: (() => {
                  const i0 = s.timesS.indexOf(win[0]);
                  const y0 = s.values[i0] ?? 0;
                  return [y0, y0 + w.rate * (win[1] - win[0])];
                })(),
                line: { color: "#a16207", width: 2 },
              },
            ]
          : []),
      ]}
      layout={{
        ...baseLayout,
        height: 220,
        showlegend: false,
        title: { text: `Progress curve of ${w.well}`, font: { size: 12 }, x: 0 },
        xaxis: { title: { text: "time (s)" } },
        yaxis: { title: { text: "signal (signal units)" } },
      }}
      config={baseConfig}
      useResizeHandler
      style={{ width: "100%", height: 220 }}
    />
  );
}
