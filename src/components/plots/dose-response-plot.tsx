"use client";
import { useMemo } from "react";
import { logistic4 } from "@/lib/kinetics/logistic4";
import { Plot, baseConfig, baseLayout } from "./plot";
import { ACCENT, INK, MASK, clickedKey, overlayTraces, type PlotMarks, type PlotWell } from "./marks";

export type { PlotMarks, PlotWell };

export type DoseResponseFitView = {
  topPct: number | null;
  bottomPct: number | null;
  log10Ic50: number | null;
  hill: number | null;
  direction: "falling" | "rising" | "flat";
  ic50Ci95Um: [number | null, number | null];
};

/**
 * % inhibition against concentration (log axis) with the fitted four-parameter logistic, the
 * curves at the ends of the IC50's 95 % CI as a shaded band, and masked wells as open crosses
 * (left out of the fit). With `onPointClick` every well is clickable (its key is the marker's
 * customdata); `reference` draws a second fit dashed (the stored one while a preview is shown).
 */
export function DoseResponsePlot({
  points,
  masked,
  fit,
  height = 340,
  wells,
  maskedWells,
  marks = {},
  reference = null,
  fitLabel = "4PL fit",
  referenceLabel = "stored fit",
  onPointClick,
}: {
  points: [number, number][];
  masked: [number, number][];
  fit: DoseResponseFitView | null;
  height?: number;
  /** The same wells as `points`, with keys (when clickable). */
  wells?: PlotWell[];
  /** The same wells as `masked`, with keys (when clickable). */
  maskedWells?: PlotWell[];
  marks?: PlotMarks;
  reference?: DoseResponseFitView | null;
  fitLabel?: string;
  referenceLabel?: string;
  onPointClick?: (key: string) => void;
}) {
  const traces = useMemo(() => {
    const xs = [...points, ...masked].map((p) => p[0]).filter((x) => x > 0);
    const lo = xs.length ? Math.min(...xs) / 3 : 1e-3;
    const hi = xs.length ? Math.max(...xs) * 3 : 1e3;
    const grid = Array.from(
      { length: 120 },
      (_, k) => 10 ** (Math.log10(lo) + (k / 119) * (Math.log10(hi) - Math.log10(lo))),
    );
    const drawable = (f: DoseResponseFitView | null): f is DoseResponseFitView & Record<string, number> =>
      !!f && f.topPct !== null && f.bottomPct !== null && f.log10Ic50 !== null && f.hill !== null;
    const curveOf = (f: DoseResponseFitView, l: number) => {
      const h = f.direction === "rising" ? -f.hill! : f.hill!;
      return grid.map((x) => logistic4(x, f.topPct!, f.bottomPct!, l, h));
    };
    const t: object[] = [];
    if (drawable(fit)) {
      const [ciLo, ciHi] = fit.ic50Ci95Um;
      if (ciLo && ciHi) {
        t.push({
          x: grid,
          y: curveOf(fit, Math.log10(ciLo)),
          mode: "lines",
          line: { width: 0 },
          hoverinfo: "skip",
          showlegend: false,
        });
        t.push({
          x: grid,
          y: curveOf(fit, Math.log10(ciHi)),
          mode: "lines",
          line: { width: 0 },
          fill: "tonexty",
          fillcolor: "rgba(15,118,110,0.12)",
          name: "IC50 95 % CI",
          hoverinfo: "skip",
        });
      }
      t.push({
        x: grid,
        y: curveOf(fit, fit.log10Ic50!),
        mode: "lines",
        line: { color: ACCENT, width: 2 },
        name: fitLabel,
        hoverinfo: "skip",
      });
    }
    if (drawable(reference)) {
      t.push({
        x: grid,
        y: curveOf(reference, reference.log10Ic50!),
        mode: "lines",
        line: { color: "#98a2ab", width: 1.5, dash: "dash" },
        name: referenceLabel,
        hoverinfo: "skip",
      });
    }
    const keyed = wells && wells.length === points.length ? wells : null;
    t.push({
      x: points.map((p) => p[0]),
      y: points.map((p) => p[1]),
      ...(keyed ? { customdata: keyed.map((w) => w.key), text: keyed.map((w) => w.label ?? "") } : {}),
      mode: "markers",
      marker: { color: INK, size: 7 },
      name: "wells in the fit",
      hovertemplate: keyed
        ? "%{text}<br>%{x:.3g} µM · %{y:.1f} % inhibition<extra>click to exclude</extra>"
        : "%{x:.3g} µM · %{y:.1f} % inhibition<extra></extra>",
    });
    if (masked.length) {
      const keyedMasked = maskedWells && maskedWells.length === masked.length ? maskedWells : null;
      t.push({
        x: masked.map((p) => p[0]),
        y: masked.map((p) => p[1]),
        ...(keyedMasked
          ? { customdata: keyedMasked.map((w) => w.key), text: keyedMasked.map((w) => w.label ?? "") }
          : {}),
        mode: "markers",
        marker: { color: MASK, size: 9, symbol: "x-open" },
        name: "excluded (left out of the fit)",
        hovertemplate: keyedMasked
          ? "excluded · %{text}<br>%{x:.3g} µM · %{y:.1f} % inhibition<extra>click to restore</extra>"
          : "excluded · %{x:.3g} µM · %{y:.1f} % inhibition<extra></extra>",
      });
    }
    t.push(...overlayTraces([...(wells ?? []), ...(maskedWells ?? [])], marks));
    return t;
  }, [points, masked, fit, wells, maskedWells, marks, reference, fitLabel, referenceLabel]);
  return (
    <Plot
      data={traces as never}
      layout={{
        ...baseLayout,
        height,
        hovermode: "closest",
        xaxis: { type: "log", title: { text: "Inhibitor concentration (µM, log scale)" }, gridcolor: "#eceae4" },
        yaxis: { title: { text: "Inhibition (%)" }, gridcolor: "#eceae4", zeroline: true, zerolinecolor: "#cfcbc1" },
        legend: { orientation: "h", y: -0.25 },
      }}
      config={baseConfig}
      style={{ width: "100%" }}
      useResizeHandler
      onClick={
        onPointClick
          ? (e) => {
              const k = clickedKey(e);
              if (k) onPointClick(k);
            }
          : undefined
      }
    />
  );
}
