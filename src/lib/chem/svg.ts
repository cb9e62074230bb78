/**
 * Structure thumbnails as SVG text, drawn by openchemlib's depictor.
 *
 * - Deterministic: the same molecule, size and id give byte-identical output. A molecule given as
 *   an ID code gets coordinates from openchemlib's coordinate inventor, which is seeded (the
 *   default seed 0); a molecule that already has coordinates (e.g. from a molfile) keeps them, so
 *   a chemist's own drawing is shown as drawn.
 * - Self-contained: generic `sans-serif` font family, no external fonts, images or links.
 * - Sanitised: openchemlib escapes atom labels; custom atom labels are not drawn at all; the
 *   invisible hit-test overlays (`class="event"`) are removed; the result is checked against an
 *   allow-list of elements and attributes and anything else (script, foreignObject, on* handlers,
 *   href) is refused. Safe to inline with `dangerouslySetInnerHTML` only because of this check.
 * - The element id is `idPrefix` + a short hash of the structure key, so several thumbnails on
 *   one page do not share CSS scope; pass a distinct prefix when the same structure appears twice.
 */
import { Molecule } from "openchemlib";

export interface SvgOptions {
  /** Pixel width and height, 16–2000. Defaults 160 × 120. */
  width?: number;
  height?: number;
  /** Prefix of the svg element's id; letters, digits, `-` and `_`. Default "mol-". */
  idPrefix?: string;
  /** Draw CIP labels and the "abs"/"rel" stereo note. Default false (thumbnails stay clean). */
  stereoLabels?: boolean;
}

const ALLOWED_ELEMENTS = new Set([
  "svg",
  "style",
  "text",
  "line",
  "polygon",
  "polyline",
  "path",
  "circle",
  "rect",
  "g",
]);
const ALLOWED_ATTRIBUTES = new Set([
  "id",
  "xmlns",
  "version",
  "width",
  "height",
  "viewBox",
  "x",
  "y",
  "x1",
  "y1",
  "x2",
  "y2",
  "cx",
  "cy",
  "r",
  "d",
  "points",
  "stroke",
  "stroke-width",
  "fill",
  "font-size",
  "font-family",
  "font-weight",
  "opacity",
  "class",
  "text-anchor",
  "dominant-baseline",
  "style",
]);

function shortHash(text: string): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 0x01000193);
  return (h >>> 0).toString(36);
}

/** Throws if the SVG contains anything outside the allow-lists; returns it unchanged otherwise. */
export function assertSafeSvg(svg: string): string {
  if (/<!|<\?|javascript:|url\s*\(|@import|&#/i.test(svg)) throw new Error("SVG contains a forbidden construct.");
  for (const tag of svg.matchAll(/<\/?\s*([a-zA-Z][\w:-]*)([^>]*)>/g)) {
    const name = tag[1] ?? "";
    if (!ALLOWED_ELEMENTS.has(name)) throw new Error(`SVG contains a forbidden element <${name}>.`);
    for (const attr of (tag[2] ?? "").matchAll(/([\w:-]+)\s*=/g)) {
      const attrName = attr[1] ?? "";
      if (!ALLOWED_ATTRIBUTES.has(attrName)) throw new Error(`SVG contains a forbidden attribute ${attrName}.`);
    }
  }
  return svg;
}

/** False for a molecule parsed without coordinates (all atoms at the origin). */
function hasCoordinates(mol: Molecule): boolean {
  if (mol.getAllAtoms() < 2) return true;
  for (let a = 0; a < mol.getAllAtoms(); a++) if (mol.getAtomX(a) !== 0 || mol.getAtomY(a) !== 0) return true;
  return false;
}

function clampSize(value: number | undefined, fallback: number): number {
  const v = value ?? fallback;
  if (!Number.isFinite(v)) return fallback;
  return Math.min(2000, Math.max(16, Math.round(v)));
}

/**
 * SVG text of a structure. `structure` is an openchemlib molecule or an ID code (structure key).
 * Throws only if openchemlib produced something that fails the safety check (a bug, not bad input).
 */
export function structureSvg(structure: Molecule | string, options: SvgOptions = {}): string {
  const width = clampSize(options.width, 160);
  const height = clampSize(options.height, 120);
  const prefix = /^[A-Za-z][\w-]{0,31}$/.test(options.idPrefix ?? "") ? (options.idPrefix as string) : "mol-";
  let mol = typeof structure === "string" ? Molecule.fromIDCode(structure, true) : structure;
  if (!hasCoordinates(mol)) {
    mol = mol.getCompactCopy();
    mol.inventCoordinates();
  }
  const id = `${prefix}${shortHash(typeof structure === "string" ? structure : mol.getIDCode())}`;
  const stereo = options.stereoLabels === true;
  const raw = mol.toSVG(width, height, id, {
    noAtomCustomLabels: true,
    suppressChiralText: !stereo,
    suppressCIPParity: !stereo,
    suppressESR: !stereo,
    noStereoProblem: true,
  });
  const cleaned = raw
    .replace(/^\s*<(line|circle)\b[^>]*\bclass="event"[^>]*\/>\s*$/gm, "")
    .replace(new RegExp(`\\s*#${id} \\{ pointer-events:none; \\} #${id} \\.event\\s*\\{ pointer-events:all; \\}`), "")
    .replace(/\n{2,}/g, "\n");
  return assertSafeSvg(cleaned);
}
