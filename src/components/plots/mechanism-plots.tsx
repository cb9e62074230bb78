"use client";
import { useMemo } from "react";
import { inhibitedRate, type InhibitionModel } from "@/lib/kinetics/inhibition-models";
import { Plot, baseConfig, baseLayout } from "./plot";

export type MechanismModelView = {
  vmax: number | null;
  kmUm: number | null;
  kicUm: number | null;
  kiuUm: number | null;
};

const palette = ["#1d2630", "#0f766e", "#a16207", "#35608f", "#b42318", "#6b4fa0", "#2f7d4f"];
const axis = { gridcolor: "#eceae4", zerolinecolor: "#cfcbc1" };

function levels(points: [number, number, number][]) {
  return [...new Set(points.map((p) => p[1]))].sort((a, b) => a - b);
}

/** Initial rate against [S] for each [I], with the chosen model's global-fit curves. */
export function RateVsSubstratePlot({
  points,
  model,
  fit,
  rateUnit,
}: {
  points: [number, number, number][];
  model: InhibitionModel;
  fit: MechanismModelView;
  rateUnit: string;
}) {
  const data = useMemo(() => {
    const sMax = Math.max(...points.map((p) => p[0])) * 1.05;
    const grid = Array.from({ length: 100 }, (_, k) => (k / 99) * sMax);
    return levels(points).flatMap((i, k) => {
      const color = palette[k % palette.length];
      const pts = points.filter((p) => p[1] === i);
      const out: object[] = [
        {
          x: pts.map((p) => p[0]),
          y: pts.map((p) => p[2]),
          mode: "markers",
          marker: { color, size: 6 },
          name: `[I] = ${i} µM`,
          legendgroup: String(i),
        },
      ];
      if (fit.vmax !== null && fit.kmUm !== null) {
        out.push({
          x: grid,
          y: grid.map((s) =>
            inhibitedRate(model, s, i, { vmax: fit.vmax!, km: fit.kmUm!, kic: fit.kicUm, kiu: fit.kiuUm }),
          ),
          mode: "lines",
          line: { color, width: 1.5 },
          showlegend: false,
          legendgroup: String(i),
          hoverinfo: "skip",
        });
      }
      return out;
    });
  }, [points, model, fit]);
  return (
    <Plot
      data={data as never}
      layout={{
        ...baseLayout,
        height: 320,
        title: { text: `Rate vs [S], ${model} fit`, font: { size: 12 } },
        xaxis: { ...axis, title: { text: "[S] (µM)" } },
        yaxis: { ...axis, title: { text: `Initial rate (${rateUnit})` } },
        legend: { font: { size: 10 } },
      }}
      config={baseConfig}
      style={{ width: "100%" }}
      useResizeHandler
    />
  );
}

/** 1/v against 1/[S]: a diagnostic view of the data and of the fitted model's lines (the fit itself is not made here). */
export function DoubleReciprocalPlot({
  points,
  model,
  fit,
  rateUnit,
}: {
  points: [number, number, number][];
  model: InhibitionModel;
  fit: MechanismModelView;
  rateUnit: string;
}) {
  const data = useMemo(() => {
    const usable = points.filter((p) => p[0] > 0 && p[2] > 0);
    const xMax = Math.max(...usable.map((p) => 1 / p[0])) * 1.05;
    const km = fit.kmUm ?? 1;
    const xMin = -1.2 / km;
    return levels(usable).flatMap((i, k) => {
      const color = palette[k % palette.length];
      const pts = usable.filter((p) => p[1] === i);
      const out: object[] = [
        {
          x: pts.map((p) => 1 / p[0]),
          y: pts.map((p) => 1 / p[2]),
          mode: "markers",
          marker: { color, size: 6 },
          name: `[I] = ${i} µM`,
          legendgroup: String(i),
        },
      ];
      if (fit.vmax !== null && fit.kmUm !== null) {
        const a = fit.kicUm ? 1 / fit.kicUm : 0;
        const b = fit.kiuUm ? 1 / fit.kiuUm : 0;
        const slope = (fit.kmUm / fit.vmax) * (1 + (model === "uncompetitive" ? 0 : a) * i);
        const icpt = (1 + (model === "competitive" ? 0 : b) * i) / fit.vmax;
        out.push({
          x: [xMin, xMax],
          y: [icpt + slope * xMin, icpt + slope * xMax],
          mode: "lines",
          line: { color, width: 1.2 },
          showlegend: false,
          legendgroup: String(i),
          hoverinfo: "skip",
        });
      }
      return out;
    });
  }, [points, model, fit]);
  return (
    <Plot
      data={data as never}
      layout={{
        ...baseLayout,
        height: 320,
        title: { text: "Double-reciprocal (diagnostic only; not used for fitting)", font: { size: 12 } },
        xaxis: { ...axis, title: { text: "1/[S] (1/µM)" }, zeroline: true },
        yaxis: { ...axis, title: { text: `1/v (1/(${rateUnit}))` }, zeroline: true },
        showlegend: false,
      }}
      config={baseConfig}
      style={{ width: "100%" }}
      useResizeHandler
    />
  );
}

/** Residuals (observed − fitted) of the chosen model against [S], per [I]. */
export function ResidualPlot({
  points,
  model,
  fit,
  rateUnit,
}: {
  points: [number, number, number][];
  model: InhibitionModel;
  fit: MechanismModelView;
  rateUnit: string;
}) {
  const data = useMemo(() => {
    if (fit.vmax === null || fit.kmUm === null) return [];
    return levels(points).map((i, k) => {
      const pts = points.filter((p) => p[1] === i);
      return {
        x: pts.map((p) => p[0]),
        y: pts.map(
          (p) =>
            p[2] - inhibitedRate(model, p[0], i, { vmax: fit.vmax!, km: fit.kmUm!, kic: fit.kicUm, kiu: fit.kiuUm }),
        ),
        mode: "markers",
        marker: { color: palette[k % palette.length], size: 5 },
        name: `[I] = ${i} µM`,
      };
    });
  }, [points, model, fit]);
  return (
    <Plot
      data={data as never}
      layout={{
        ...baseLayout,
        height: 240,
        title: { text: "Residuals of the chosen model", font: { size: 12 } },
        xaxis: { ...axis, title: { text: "[S] (µM)" } },
        yaxis: { ...axis, title: { text: `Observed − fitted (${rateUnit})` }, zeroline: true },
        showlegend: false,
      }}
      config={baseConfig}
      style={{ width: "100%" }}
      useResizeHandler
    />
  );
}
