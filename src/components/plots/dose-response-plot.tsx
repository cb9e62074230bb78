"use client";
import { useMemo } from "react";
import { logistic4 } from "@/lib/kinetics/logistic4";
import { Plot, baseConfig, baseLayout } from "./plot";

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
 * (left out of the fit).
 */
export function DoseResponsePlot({
  points,
  masked,
  fit,
  height = 340,
}: {
  points: [number, number][];
  masked: [number, number][];
  fit: DoseResponseFitView | null;
  height?: number;
}) {
  const traces = useMemo(() => {
    const xs = [...points, ...masked].map((p) => p[0]).filter((x) => x > 0);
    const lo = Math.min(...xs) / 3;
    const hi = Math.max(...xs) * 3;
    const grid = Array.from(
      { length: 120 },
      (_, k) => 10 ** (Math.log10(lo) + (k / 119) * (Math.log10(hi) - Math.log10(lo))),
    );
    const t: object[] = [];
    if (fit && fit.topPct !== null && fit.bottomPct !== null && fit.log10Ic50 !== null && fit.hill !== null) {
      const h = fit.direction === "rising" ? -fit.hill : fit.hill;
      const curve = (l: number) => grid.map((x) => logistic4(x, fit.topPct!, fit.bottomPct!, l, h));
      const [ciLo, ciHi] = fit.ic50Ci95Um;
      if (ciLo && ciHi) {
        t.push({
          x: grid,
          y: curve(Math.log10(ciLo)),
          mode: "lines",
          line: { width: 0 },
          hoverinfo: "skip",
          showlegend: false,
        });
        t.push({
          x: grid,
          y: curve(Math.log10(ciHi)),
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
        y: curve(fit.log10Ic50),
        mode: "lines",
        line: { color: "#0f766e", width: 2 },
        name: "4PL fit",
        hoverinfo: "skip",
      });
    }
    t.push({
      x: points.map((p) => p[0]),
      y: points.map((p) => p[1]),
      mode: "markers",
      marker: { color: "#1d2630", size: 6 },
      name: "wells",
      hovertemplate: "%{x:.3g} µM · %{y:.1f} %<extra></extra>",
    });
    if (masked.length) {
      t.push({
        x: masked.map((p) => p[0]),
        y: masked.map((p) => p[1]),
        mode: "markers",
        marker: { color: "#b42318", size: 8, symbol: "x-open" },
        name: "masked (left out)",
        hovertemplate: "masked · %{x:.3g} µM · %{y:.1f} %<extra></extra>",
      });
    }
    return t;
  }, [points, masked, fit]);
  return (
    <Plot
      data={traces as never}
      layout={{
        ...baseLayout,
        height,
        xaxis: { type: "log", title: { text: "Inhibitor concentration (µM, log scale)" }, gridcolor: "#eceae4" },
        yaxis: { title: { text: "Inhibition (%)" }, gridcolor: "#eceae4", zeroline: true, zerolinecolor: "#cfcbc1" },
        legend: { orientation: "h", y: -0.25 },
      }}
      config={baseConfig}
      style={{ width: "100%" }}
      useResizeHandler
    />
  );
}
