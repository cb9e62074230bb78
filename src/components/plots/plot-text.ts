/**
 * Plotly draws text (hover labels, trace names, titles, tick labels) through its own small markup
 * language: <b>, <i>, <br>, <sub>, <sup>, <span style>, <a href> are rendered, and entities are
 * decoded. Text a person typed or uploaded (barcodes, compound ids, labels) must show as written,
 * so its markup characters become entities, which Plotly shows literally. Our own hovertemplates
 * keep their markup and put user text in through %{text} / %{customdata} only.
 */
export function plotText(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

type Textish = string | number | null | undefined | readonly Textish[];

/** plotText over a string or a (nested) array of them; numbers and blanks stay as they are. */
export function plotTexts<T extends Textish>(v: T): T {
  if (typeof v === "string") return plotText(v) as T;
  if (Array.isArray(v)) return v.map((x) => plotTexts(x as Textish)) as unknown as T;
  return v;
}

const TEXT_KEYS = ["text", "hovertext", "name", "ticktext"] as const;

/**
 * Every trace's text, hovertext, name and tick text escaped (hovertemplate and texttemplate are
 * ours and keep their markup). Applied by the one Plot component to every chart.
 */
export function escapeTraces<T extends object>(data: readonly T[]): T[] {
  return data.map((trace) => {
    const t = { ...trace } as Record<string, unknown>;
    for (const k of TEXT_KEYS) if (k in t) t[k] = plotTexts(t[k] as Textish);
    return t as T;
  });
}

/** The layout's title, axis titles and annotations escaped the same way. */
export function escapeLayout<T extends object | undefined>(layout: T): T {
  if (!layout) return layout;
  const out = { ...layout } as Record<string, unknown>;
  const fixTitle = (o: unknown) => {
    if (typeof o === "string") return plotText(o);
    if (o && typeof o === "object" && typeof (o as { text?: unknown }).text === "string")
      return { ...o, text: plotText((o as { text: string }).text) };
    return o;
  };
  for (const [k, v] of Object.entries(out)) {
    if (k === "title") out[k] = fixTitle(v);
    else if (/^[xy]axis\d*$/.test(k) && v && typeof v === "object") {
      const axis = { ...(v as Record<string, unknown>) };
      if ("title" in axis) axis.title = fixTitle(axis.title);
      if ("ticktext" in axis) axis.ticktext = plotTexts(axis.ticktext as Textish);
      out[k] = axis;
    } else if (k === "annotations" && Array.isArray(v))
      out[k] = v.map((a) =>
        a && typeof a === "object" && typeof a.text === "string" ? { ...a, text: plotText(a.text) } : a,
      );
  }
  return out as T;
}
