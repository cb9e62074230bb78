"use client";
import dynamic from "next/dynamic";
import type { PlotParams } from "react-plotly.js";
import { escapeLayout, escapeTraces } from "./plot-text";

/**
 * The one Plotly chart component: the minified distribution through react-plotly.js's factory
 * (the full plotly.js is not installed), loaded in the browser only. Every trace's text, names
 * and titles are escaped on the way in (plot-text.ts), so uploaded text never renders as markup.
 */
export const Plot = dynamic<PlotParams>(
  async () => {
    const [{ default: Plotly }, { default: createPlotlyComponent }] = await Promise.all([
      import("plotly.js-dist-min"),
      import("react-plotly.js/factory"),
    ]);
    const Inner = createPlotlyComponent(Plotly);
    return function EscapedPlot(props: PlotParams) {
      const data = escapeTraces((props.data ?? []) as object[]) as PlotParams["data"];
      const layout = escapeLayout(props.layout as object | undefined) as PlotParams["layout"];
      return <Inner {...props} data={data} layout={layout} />;
    };
  },
  {
    ssr: false,
    loading: () => (
      <div className="flex h-full min-h-40 items-center justify-center text-xs text-ink-faint">Loading chart…</div>
    ),
  },
);

/** Calm defaults shared by every chart: the app's font and colours, no logo, small margins. */
export const baseLayout = {
  font: { family: "Inter Variable, system-ui, sans-serif", size: 11, color: "#3c4956" },
  paper_bgcolor: "rgba(0,0,0,0)",
  plot_bgcolor: "#ffffff",
  margin: { l: 44, r: 12, t: 28, b: 36 },
} as const;

export const baseConfig = {
  displaylogo: false,
  responsive: true,
  modeBarButtonsToRemove: ["lasso2d", "select2d", "autoScale2d"],
} as PlotParams["config"];
