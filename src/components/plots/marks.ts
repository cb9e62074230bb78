/**
 * What the clickable plots share: a well with its key (run id|well), the rings drawn over
 * proposed outliers, unsaved changes and the selected well, and reading a click's key.
 */
export const ACCENT = "#0f766e";
export const INK = "#1d2630";
export const MASK = "#b42318";
const PROPOSED = "#a16207";

/** A well drawn on the plot with its key (run id|well), so a click can name it. */
export type PlotWell = { key: string; x: number; y: number; label?: string };

/** Marks drawn over wells: proposed outliers, changes not yet saved, the selected well. */
export type PlotMarks = {
  /** Wells the engine proposes as outliers (not dropped): drawn with their own ring. */
  proposed?: PlotWell[];
  proposedLabel?: string;
  /** Wells whose in/out state differs from what is stored (preview, not saved). */
  changedKeys?: ReadonlySet<string>;
  selectedKey?: string | null;
};

/** Plotly's click event: the customdata of the clicked marker is the well's key. */
export function clickedKey(e: { points: readonly { customdata?: unknown }[] }): string | null {
  const c = e.points[0]?.customdata;
  return typeof c === "string" ? c : null;
}

/** Rings over the wells that are proposed, changed or selected (clickable like the wells below). */
export function overlayTraces(all: readonly PlotWell[], marks: PlotMarks): object[] {
  const t: object[] = [];
  const hover = `%{text}<extra></extra>`;
  if (marks.proposed?.length) {
    t.push({
      x: marks.proposed.map((p) => p.x),
      y: marks.proposed.map((p) => p.y),
      customdata: marks.proposed.map((p) => p.key),
      text: marks.proposed.map((p) => `${marks.proposedLabel ?? "proposed: outlier"} · ${p.label ?? ""}`),
      mode: "markers",
      marker: { color: PROPOSED, size: 15, symbol: "diamond-open", line: { width: 2, color: PROPOSED } },
      name: marks.proposedLabel ?? "proposed: outlier",
      hovertemplate: hover,
    });
  }
  const changed = all.filter((p) => marks.changedKeys?.has(p.key));
  if (changed.length) {
    t.push({
      x: changed.map((p) => p.x),
      y: changed.map((p) => p.y),
      customdata: changed.map((p) => p.key),
      text: changed.map((p) => `changed, not saved · ${p.label ?? ""}`),
      mode: "markers",
      marker: { color: ACCENT, size: 17, symbol: "circle-open", line: { width: 1.5, color: ACCENT } },
      name: "changed (preview, not saved)",
      hovertemplate: hover,
    });
  }
  const sel = all.find((p) => p.key === marks.selectedKey);
  if (sel) {
    t.push({
      x: [sel.x],
      y: [sel.y],
      customdata: [sel.key],
      text: [`selected · ${sel.label ?? ""}`],
      mode: "markers",
      marker: { color: INK, size: 22, symbol: "square-open", line: { width: 1, color: INK } },
      showlegend: false,
      hovertemplate: hover,
    });
  }
  return t;
}
