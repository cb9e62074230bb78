"use client";
import { useRouter } from "next/navigation";
import { Plot, baseConfig, baseLayout } from "./plot";

export type TrendPoint = {
  id: string;
  label: string;
  at: string;
  zPrime: number | null;
  verdict: "pass" | "fail";
  decision: string;
};

/** Z′ of each run in upload order, with the campaign's minimum as a dashed line. */
export function ZPrimeTrend({
  points,
  minZPrime,
  runHref,
}: {
  points: TrendPoint[];
  minZPrime: number;
  runHref: string;
}) {
  const router = useRouter();
  const withZ = points.filter((p) => p.zPrime !== null);
  const series = (verdict: "pass" | "fail") => {
    const ps = withZ.filter((p) => p.verdict === verdict);
    return {
      type: "scatter" as const,
      mode: "markers" as const,
      name: verdict === "pass" ? "QC pass" : "QC fail",
      x: ps.map((p) => p.at),
      y: ps.map((p) => p.zPrime),
      customdata: ps.map((p) => p.id),
      text: ps.map((p) => `${p.label} · ${p.decision}`),
      hovertemplate: "%{text}<br>Z′ %{y:.3f}<br>%{x}<extra></extra>",
      marker: {
        size: 8,
        symbol: verdict === "pass" ? "circle" : "diamond",
        color: verdict === "pass" ? "#2f7d4f" : "#b42318",
      },
    };
  };
  const xs = withZ.map((p) => p.at);
  return (
    <Plot
      data={[
        series("pass"),
        series("fail"),
        {
          type: "scatter",
          mode: "lines",
          name: `minimum Z′ ${minZPrime}`,
          x: xs.length ? [xs[0]!, xs[xs.length - 1]!] : [],
          y: [minZPrime, minZPrime],
          line: { dash: "dash", color: "#a16207", width: 1.5 },
          hoverinfo: "skip",
        },
      ]}
      layout={{
        ...baseLayout,
        height: 230,
        margin: { l: 48, r: 12, t: 12, b: 40 },
        showlegend: true,
        legend: { orientation: "h", y: 1.12, x: 0, font: { size: 10 } },
        xaxis: { title: { text: "uploaded" }, showgrid: false },
        yaxis: {
          title: { text: "Z′ (dimensionless)" },
          range: [Math.min(0, ...withZ.map((p) => p.zPrime!)) - 0.05, 1],
          gridcolor: "#eeece6",
          zeroline: true,
          zerolinecolor: "#cfcbc1",
        },
      }}
      config={baseConfig}
      useResizeHandler
      style={{ width: "100%", height: 230 }}
      onClick={(e) => {
        const id = e.points[0]?.customdata;
        if (typeof id === "string") router.push(`${runHref}/${id}`);
      }}
    />
  );
}
