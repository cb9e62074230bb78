"use client";
import { useMemo } from "react";
import type { PlotParams } from "react-plotly.js";
import { Plot, baseConfig, baseLayout } from "./plot";
import { plotText, plotTexts } from "./plot-text";

export type HeatmapWell = {
  index: number;
  well: string;
  role: "sample" | "neutral" | "full" | "blank" | "empty";
  value: number | null;
  masked: boolean;
  label?: string;
};

const rowName = (r: number) => (r < 26 ? String.fromCharCode(65 + r) : "A" + String.fromCharCode(65 + r - 26));

/**
 * A plate as a heatmap (row A at the top), with neutral controls ringed, full-inhibition
 * controls boxed and masked wells crossed out, so they stay visible but unmistakable.
 */
export function PlateHeatmap({
  rows,
  columns,
  wells,
  title,
  unit,
  colorscale = "Viridis",
  zmin,
  zmax,
  selected,
  onSelect,
  height = 320,
}: {
  rows: number;
  columns: number;
  wells: HeatmapWell[];
  title: string;
  unit: string;
  colorscale?: string | [number, string][];
  zmin?: number;
  zmax?: number;
  selected?: string | null;
  onSelect?: (well: string) => void;
  height?: number;
}) {
  const { data, layout } = useMemo(() => {
    const z: (number | null)[][] = Array.from({ length: rows }, () => new Array<number | null>(columns).fill(null));
    const text: string[][] = Array.from({ length: rows }, () => new Array<string>(columns).fill(""));
    const marks = {
      neutral: { x: [] as number[], y: [] as string[] },
      full: { x: [] as number[], y: [] as string[] },
      masked: { x: [] as number[], y: [] as string[] },
    };
    for (const w of wells) {
      const r = Math.floor(w.index / columns);
      const c = w.index % columns;
      z[r]![c] = w.value;
      text[r]![c] = `${w.well} · ${w.role}${w.label ? ` · ${w.label}` : ""}${w.masked ? " · masked" : ""}`;
      const mark = (m: { x: number[]; y: string[] }) => {
        m.x.push(c + 1);
        m.y.push(rowName(r));
      };
      if (w.role === "neutral") mark(marks.neutral);
      if (w.role === "full") mark(marks.full);
      if (w.masked) mark(marks.masked);
    }
    const markerSize = columns > 24 ? 5 : columns > 12 ? 9 : 14;
    const y = Array.from({ length: rows }, (_, r) => rowName(r));
    const x = Array.from({ length: columns }, (_, c) => c + 1);
    const data: PlotParams["data"] = [
      {
        type: "heatmap",
        z,
        x,
        y,
        // customdata takes the 2-D grid in Plotly's types (text is typed 1-D, though heatmaps accept 2-D).
        // Shown through %{customdata}, which Plotly renders as markup: escaped like every other text.
        customdata: plotTexts(text),
        hovertemplate: `%{customdata}<br>%{z:.4~g} ${plotText(unit)}<extra></extra>`,
        colorscale,
        zmin,
        zmax,
        xgap: 1,
        ygap: 1,
        colorbar: { title: { text: plotText(unit), side: "right" }, thickness: 10, len: 0.9 },
      },
      {
        type: "scatter",
        mode: "markers",
        name: "neutral control",
        x: marks.neutral.x,
        y: marks.neutral.y,
        hoverinfo: "skip",
        marker: { symbol: "circle-open", size: markerSize, color: "#1d2630", line: { width: 1.5 } },
      },
      {
        type: "scatter",
        mode: "markers",
        name: "full-inhibition control",
        x: marks.full.x,
        y: marks.full.y,
        hoverinfo: "skip",
        marker: { symbol: "square-open", size: markerSize, color: "#ffffff", line: { width: 1.5 } },
      },
      {
        type: "scatter",
        mode: "markers",
        name: "masked",
        x: marks.masked.x,
        y: marks.masked.y,
        hoverinfo: "skip",
        marker: { symbol: "x-thin-open", size: markerSize + 2, color: "#b42318", line: { width: 2.5 } },
      },
    ];
    const sel = selected ? /^([A-Z]{1,2})(\d+)$/.exec(selected) : null;
    const layout: PlotParams["layout"] = {
      ...baseLayout,
      title: { text: title, font: { size: 12 }, x: 0, xanchor: "left" },
      height,
      // The symbols are explained in words beside the chart (a white square vanishes in a legend).
      showlegend: false,
      xaxis: {
        side: "top",
        tickmode: "array",
        tickvals: x.filter((c) => columns <= 24 || c % 4 === 0 || c === 1),
        ticks: "",
        showgrid: false,
        fixedrange: true,
      },
      yaxis: {
        autorange: "reversed",
        tickmode: "array",
        tickvals: y.filter((_, i) => rows <= 16 || i % 2 === 0),
        ticks: "",
        showgrid: false,
        fixedrange: true,
      },
      shapes: sel
        ? [
            {
              type: "rect",
              xref: "x",
              yref: "y",
              x0: Number(sel[2]) - 0.5,
              x1: Number(sel[2]) + 0.5,
              y0: y.indexOf(sel[1]!) - 0.5,
              y1: y.indexOf(sel[1]!) + 0.5,
              line: { color: "#0f766e", width: 2.5 },
            },
          ]
        : [],
    };
    return { data, layout };
  }, [rows, columns, wells, title, unit, colorscale, zmin, zmax, selected, height]);
  return (
    <Plot
      data={data}
      layout={layout}
      config={baseConfig}
      useResizeHandler
      style={{ width: "100%", height }}
      onClick={(e) => {
        const p = e.points[0];
        if (!p || !onSelect) return;
        onSelect(`${String(p.y)}${String(p.x)}`);
      }}
    />
  );
}
