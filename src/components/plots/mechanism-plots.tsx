"use client";
import { useMemo } from "react";
import { inhibitedRate, type InhibitionModel } from "@/lib/kinetics/inhibition-models";
import { Plot, baseConfig, baseLayout } from "./plot";
import { plotText } from "./plot-text";
import { clickedKey, overlayTraces, type PlotMarks, type PlotWell } from "./marks";

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

/** The curve of `model` with `fit`'s constants at inhibitor concentration i, on the grid of [S]. */
function modelCurve(model: InhibitionModel, fit: MechanismModelView, i: number, grid: number[]): number[] | null {
  if (fit.vmax === null || fit.kmUm === null) return null;
  return grid.map((s) =>
    inhibitedRate(model, s, i, { vmax: fit.vmax!, km: fit.kmUm!, kic: fit.kicUm, kiu: fit.kiuUm }),
  );
}

/**
 * Initial rate against [S] for each [I], with the chosen model's global-fit curves. With
 * `onPointClick` every well is clickable (`wells` gives their keys, in the order of `points`);
 * `masked` wells are drawn as open crosses, left out of the fit; `reference` draws a second fit
 * dashed (the stored one while a preview is shown).
 */
export function RateVsSubstratePlot({
  points,
  model,
  fit,
  rateUnit,
  wells,
  masked = [],
  marks = {},
  reference = null,
  title,
  onPointClick,
}: {
  points: [number, number, number][];
  model: InhibitionModel;
  fit: MechanismModelView;
  rateUnit: string;
  wells?: PlotWell[];
  masked?: (PlotWell & { i: number })[];
  marks?: PlotMarks;
  reference?: { model: InhibitionModel; fit: MechanismModelView; label: string } | null;
  title?: string;
  onPointClick?: (key: string) => void;
}) {
  const data = useMemo(() => {
    const sMax = Math.max(...points.map((p) => p[0]), ...masked.map((p) => p.x)) * 1.05;
    const grid = Array.from({ length: 100 }, (_, k) => (k / 99) * sMax);
    const keyed = wells && wells.length === points.length ? wells : null;
    const allLevels = [...new Set([...points.map((p) => p[1]), ...masked.map((p) => p.i)])].sort((a, b) => a - b);
    const series = allLevels.flatMap((i, k) => {
      const color = palette[k % palette.length];
      const idx = points.flatMap((p, j) => (p[1] === i ? [j] : []));
      const out: object[] = [
        {
          x: idx.map((j) => points[j]![0]),
          y: idx.map((j) => points[j]![2]),
          ...(keyed ? { customdata: idx.map((j) => keyed[j]!.key), text: idx.map((j) => keyed[j]!.label ?? "") } : {}),
          mode: "markers",
          marker: { color, size: 7 },
          name: `[I] = ${i} µM`,
          legendgroup: String(i),
          hovertemplate: keyed
            ? `%{text}<br>[S] %{x:.3g} µM · %{y:.4g} ${plotText(rateUnit)}<extra>click to exclude</extra>`
            : `[S] %{x:.3g} µM · %{y:.4g} ${plotText(rateUnit)}<extra>[I] = ${i} µM</extra>`,
        },
      ];
      const curve = modelCurve(model, fit, i, grid);
      if (curve)
        out.push({
          x: grid,
          y: curve,
          mode: "lines",
          line: { color, width: 1.5 },
          showlegend: false,
          legendgroup: String(i),
          hoverinfo: "skip",
        });
      const ref = reference ? modelCurve(reference.model, reference.fit, i, grid) : null;
      if (ref)
        out.push({
          x: grid,
          y: ref,
          mode: "lines",
          line: { color, width: 1, dash: "dash" },
          name: reference!.label,
          showlegend: k === 0,
          legendgroup: "reference",
          hoverinfo: "skip",
        });
      return out;
    });
    if (masked.length)
      series.push({
        x: masked.map((p) => p.x),
        y: masked.map((p) => p.y),
        customdata: masked.map((p) => p.key),
        text: masked.map((p) => p.label ?? ""),
        mode: "markers",
        marker: { color: "#b42318", size: 9, symbol: "x-open" },
        name: "excluded (left out of the fit)",
        hovertemplate: `excluded · %{text}<br>[S] %{x:.3g} µM · %{y:.4g} ${plotText(rateUnit)}<extra>click to restore</extra>`,
      });
    series.push(...overlayTraces([...(wells ?? []), ...masked], marks));
    return series;
  }, [points, model, fit, rateUnit, wells, masked, marks, reference]);
  return (
    <Plot
      data={data as never}
      layout={{
        ...baseLayout,
        height: 320,
        hovermode: "closest",
        title: { text: title ?? `Rate vs [S], ${model} fit`, font: { size: 12 } },
        xaxis: { ...axis, title: { text: "[S] (µM)" } },
        yaxis: { ...axis, title: { text: `Initial rate (${rateUnit})` } },
        legend: { font: { size: 10 } },
      }}
      config={baseConfig}
      style={{ width: "100%" }}
      useResizeHandler
      onClick={
        onPointClick
          ? (e) => {
              const key = clickedKey(e);
              if (key) onPointClick(key);
            }
          : undefined
      }
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
