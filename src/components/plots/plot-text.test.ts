// Escaping of user text for Plotly's label markup (common practice: the HTML character
// references &amp; &lt; &gt; &quot; &#39; of the WHATWG HTML standard, from memory).
import { describe, it, expect } from "vitest";
import { escapeLayout, escapeTraces, plotText } from "./plot-text";

const hostile = `<b>x</b><img src=x onerror=alert(1)>`;

describe("plot text escaping", () => {
  it("turns markup characters into entities", () => {
    expect(plotText(hostile)).toBe("&lt;b&gt;x&lt;/b&gt;&lt;img src=x onerror=alert(1)&gt;");
    expect(plotText(`a & "b" 'c'`)).toBe("a &amp; &quot;b&quot; &#39;c&#39;");
    expect(plotText("IC50 · 3 µM")).toBe("IC50 · 3 µM");
  });

  it("escapes text, hovertext and names of traces (nested heatmap text too) but not hovertemplates", () => {
    const [t] = escapeTraces([
      {
        text: [hostile, [hostile]],
        hovertext: hostile,
        name: hostile,
        hovertemplate: "%{text}<br>%{y}",
        customdata: ["k"],
      },
    ]);
    expect(JSON.stringify(t)).not.toContain("<b>");
    expect(t!.hovertemplate).toBe("%{text}<br>%{y}");
    expect(t!.customdata).toEqual(["k"]);
  });

  it("escapes titles, axis titles, tick text and annotations of the layout", () => {
    const l = escapeLayout({
      title: { text: hostile, font: { size: 12 } },
      xaxis: { title: { text: hostile }, ticktext: [hostile] },
      yaxis2: { title: hostile },
      annotations: [{ text: hostile }],
    });
    expect(JSON.stringify(l)).not.toMatch(/<b>|<img/);
    expect(l.title.font.size).toBe(12);
  });
});
