import "server-only";
import crypto from "node:crypto";
import type { SvgOptions } from "@/lib/chem/svg";
import { runChem } from "./prepare-pool";

/**
 * Structure drawings (SVG) for the server: drawn in the chemistry worker pool, never on the
 * request thread, and kept in a least-recently-used cache keyed by the canonical structure (the
 * structure key) and the drawing options, bounded by entries and by bytes. A drawing depends only
 * on that key and the options (svg.ts is deterministic), so the cache needs no invalidation; a
 * structure edit changes the key.
 */
const MAX_ENTRIES = 20_000;
const MAX_BYTES = 48 * 1024 * 1024;
/** Time for one batch of drawings (a grid page of up to 200 thumbnails takes under 2 s here). */
const BATCH_LIMIT_MS = 15_000;

const g = globalThis as unknown as { __inhibitrackSvgCache?: { map: Map<string, string>; bytes: number } };
const cache = (g.__inhibitrackSvgCache ??= { map: new Map(), bytes: 0 });

function cacheKey(key: string, o: SvgOptions): string {
  return `${o.width ?? ""}x${o.height ?? ""}|${o.idPrefix ?? ""}|${o.stereoLabels ? 1 : 0}|${key}`;
}

function remember(k: string, svg: string) {
  cache.map.set(k, svg);
  cache.bytes += svg.length + k.length;
  while (cache.map.size > MAX_ENTRIES || cache.bytes > MAX_BYTES) {
    const [oldK, oldV] = cache.map.entries().next().value!;
    cache.map.delete(oldK);
    cache.bytes -= oldV.length + oldK.length;
  }
}

function recall(k: string): string | undefined {
  const v = cache.map.get(k);
  if (v !== undefined) {
    cache.map.delete(k); // move to the most recent end
    cache.map.set(k, v);
  }
  return v;
}

/**
 * SVGs for many structures with the same options, in input order; null where a structure key
 * could not be drawn. Cached ones come from memory; the rest are drawn in one worker task.
 */
export async function structureSvgs(keys: readonly string[], options: SvgOptions): Promise<(string | null)[]> {
  const out: (string | null)[] = keys.map((k) => recall(cacheKey(k, options)) ?? null);
  const missing = [...new Set(keys.filter((_, i) => out[i] === null))];
  if (missing.length > 0) {
    const drawn = await runChem<(string | null)[]>(
      { kind: "svg", items: missing.map((key) => ({ key, options })) },
      "Drawing these structures",
      BATCH_LIMIT_MS,
    );
    const byKey = new Map(missing.map((k, i) => [k, drawn[i] ?? null]));
    for (const [k, svg] of byKey) if (svg !== null) remember(cacheKey(k, options), svg);
    keys.forEach((k, i) => {
      if (out[i] === null) out[i] = byKey.get(k) ?? null;
    });
  }
  return out;
}

/** One structure's SVG (see structureSvgs); null when it cannot be drawn. */
export async function structureSvgOf(key: string, options: SvgOptions): Promise<string | null> {
  return (await structureSvgs([key], options))[0] ?? null;
}

/** A strong HTTP validator for a drawing: it depends only on the structure key and the options. */
export function drawingEtag(key: string, options: SvgOptions): string {
  return `"${crypto.createHash("sha256").update(cacheKey(key, options)).digest("base64url").slice(0, 27)}"`;
}

/**
 * The HTTP response for a drawing: immutable for a given URL is not right (a structure edit keeps
 * the registry ID), so private caching for a day with an ETag, and 304 when the browser's copy is
 * current (checked before drawing, so a revalidation costs no worker time).
 */
export async function drawingResponse(req: Request, key: string, options: SvgOptions): Promise<Response> {
  const etag = drawingEtag(key, options);
  const headers = {
    "content-type": "image/svg+xml; charset=utf-8",
    "cache-control": "private, max-age=86400",
    etag,
    "x-content-type-options": "nosniff",
    "content-security-policy": "default-src 'none'; style-src 'unsafe-inline'",
  };
  const inm = req.headers.get("if-none-match");
  if (inm && inm.split(",").some((t) => t.trim() === etag)) return new Response(null, { status: 304, headers });
  const svg = await structureSvgOf(key, options);
  if (svg === null)
    return new Response("This structure could not be drawn.", {
      status: 422,
      headers: { "content-type": "text/plain; charset=utf-8" },
    });
  return new Response(svg, { headers });
}
