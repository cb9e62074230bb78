import { describe, expect, it } from "vitest";
import { parseSmiles } from "./parse";
import { structureKey } from "./properties";
import { assertSafeSvg, structureSvg } from "./svg";

function mol(smiles: string) {
  const r = parseSmiles(smiles);
  if (!r.ok) throw new Error(r.error);
  return r.molecule;
}

describe("structureSvg", () => {
  const ibuprofen = "CC(C)Cc1ccc(cc1)[C@H](C)C(O)=O";

  it("has the requested size and a well-formed svg root (W3C SVG 1.1 root attributes)", () => {
    const svg = structureSvg(mol(ibuprofen), { width: 200, height: 150 });
    expect(svg).toMatch(/^<svg id="mol-[a-z0-9]+" xmlns="http:\/\/www\.w3\.org\/2000\/svg"/);
    expect(svg).toContain('width="200px" height="150px" viewBox="0 0 200 150"');
    expect(svg.trim().endsWith("</svg>")).toBe(true);
  });

  it("is deterministic: same input, same bytes; from the key, the same drawing for any input order", () => {
    expect(structureSvg(mol(ibuprofen))).toBe(structureSvg(mol(ibuprofen)));
    const a = structureKey(mol("OC(=O)c1ccccc1OC(C)=O"));
    const b = structureKey(mol("CC(=O)Oc1ccccc1C(O)=O"));
    expect(structureSvg(a)).toBe(structureSvg(b));
  });

  it("has no scripts, event overlays, external fonts or links", () => {
    const svg = structureSvg(mol(ibuprofen));
    expect(svg).not.toMatch(/<script|onload|href|@font-face|url\(|class="event"/i);
    expect(svg).toContain("font-family: sans-serif");
  });

  it("omits stereo labels by default and can show them", () => {
    expect(structureSvg(mol(ibuprofen))).not.toContain(">abs<");
    expect(structureSvg(mol(ibuprofen), { stereoLabels: true })).toContain(">abs<");
  });

  it("draws a molecule parsed without coordinates with real bond lengths", () => {
    const svg = structureSvg(mol("CCO"));
    const line = /<line x1="([\d.]+)" y1="([\d.]+)" x2="([\d.]+)" y2="([\d.]+)"/.exec(svg);
    expect(line).not.toBeNull();
    const [, x1, y1, x2, y2] = (line ?? []).map(Number);
    expect(Math.hypot((x2 ?? 0) - (x1 ?? 0), (y2 ?? 0) - (y1 ?? 0))).toBeGreaterThan(5);
  });

  it("clamps silly sizes and ignores an unsafe id prefix", () => {
    const svg = structureSvg(mol("CCO"), { width: 1e9, height: -5, idPrefix: '"><script>' });
    expect(svg).toContain('width="2000px" height="16px"');
    expect(svg).toMatch(/^<svg id="mol-/);
  });

  it("the safety check refuses scripts and handlers", () => {
    expect(() => assertSafeSvg("<svg><script>alert(1)</script></svg>")).toThrow(/forbidden element <script>/);
    expect(() => assertSafeSvg('<svg onload="x()"></svg>')).toThrow(/forbidden attribute onload/);
    expect(() => assertSafeSvg('<svg><a href="javascript:x"></a></svg>')).toThrow(/forbidden/);
  });
});
