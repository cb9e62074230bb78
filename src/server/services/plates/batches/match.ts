import "server-only";
import { readCsv, CsvSyntaxError } from "@/lib/csv/read";
import { decodeText } from "@/lib/plates/text-table";
import { AppError } from "@/server/errors";

export type ManifestRow = { line: number; fileName: string; barcode: string | null; plateMap: string | null };
export type MapRef = { id: string; name: string };
export type Match = { plateMapId: string | null; barcode: string | null; matchedBy: string | null; message?: string };

const MAX_MANIFEST_BYTES = 1024 * 1024;
const norm = (s: string) => s.trim().toLowerCase();
const baseName = (s: string) => s.split(/[\\/]/).pop() ?? s;

/** The optional manifest: a CSV with the header `file_name,barcode,plate_map` (plate map by name or id). */
export function parseManifest(bytes: Uint8Array): ManifestRow[] {
  if (bytes.byteLength > MAX_MANIFEST_BYTES) throw new AppError("too_large", "manifest: the limit is 1 MB.");
  let rows;
  try {
    rows = readCsv(decodeText(bytes), { skipBlankRows: true });
  } catch (e) {
    if (e instanceof CsvSyntaxError) throw new AppError("bad_request", `manifest, line ${e.line}: ${e.detail}.`);
    throw e;
  }
  const [head, ...body] = rows;
  const cols = (head?.cells ?? []).map(norm);
  const at = (k: string) => cols.indexOf(k);
  if (at("file_name") < 0 || (at("barcode") < 0 && at("plate_map") < 0))
    throw new AppError(
      "bad_request",
      "manifest, line 1: the header must be file_name,barcode,plate_map (plate_map is a plate map's name or id).",
    );
  const seen = new Set<string>();
  return body.map((r) => {
    const cell = (k: string) => (at(k) >= 0 ? (r.cells[at(k)] ?? "").trim() || null : null);
    const fileName = cell("file_name");
    if (!fileName) throw new AppError("bad_request", `manifest, line ${r.line}: file_name is empty.`);
    const key = norm(baseName(fileName));
    if (seen.has(key)) throw new AppError("bad_request", `manifest, line ${r.line}: ${fileName} is listed twice.`);
    seen.add(key);
    return { line: r.line, fileName, barcode: cell("barcode")?.slice(0, 64) ?? null, plateMap: cell("plate_map") };
  });
}

/** `Barcode: X` (or `Plate barcode,X`, `Barcode=X`) in the first lines of a text export; null for a workbook. */
export function headerBarcode(bytes: Uint8Array): string | null {
  if (bytes[0] === 0x50 && bytes[1] === 0x4b) return null;
  const head = decodeText(bytes.subarray(0, 4096)).split(/\r?\n/).slice(0, 20);
  for (const line of head) {
    const m = /^\s*"?(?:plate\s*)?barcode"?\s*[:=,;\t]\s*"?([A-Za-z0-9._-]{1,64})"?/i.exec(line);
    if (m) return m[1]!;
  }
  return null;
}

/** Whether `token` occurs in `text` bounded by non-alphanumerics (so "P1" is not found in "P12"). */
function containsToken(text: string, token: string): boolean {
  const t = norm(text);
  const k = norm(token);
  for (let i = t.indexOf(k); i >= 0; i = t.indexOf(k, i + 1)) {
    const before = i === 0 ? "" : t[i - 1]!;
    const after = t[i + k.length] ?? "";
    if (!/[a-z0-9]/.test(before) && !/[a-z0-9]/.test(after)) return true;
  }
  return false;
}

function mapByRef(maps: MapRef[], ref: string): MapRef | undefined {
  return maps.find((m) => m.id === ref) ?? maps.find((m) => norm(m.name) === norm(ref));
}

/**
 * Which plate map a file uses: its manifest row (plate_map, or a barcode equal to a map's name);
 * else a plate map's name (or its first word) found as a token in the export's header barcode or
 * the file name (the longest match wins; two different maps of the same length leave it unmatched); else the
 * request's default plate map; else unmatched, for a person to assign.
 */
export function matchPlateMap(
  fileName: string,
  bytes: Uint8Array,
  maps: MapRef[],
  manifest: Map<string, ManifestRow> | null,
  defaultMapId: string | null,
): Match {
  const row = manifest?.get(norm(baseName(fileName)));
  const header = headerBarcode(bytes);
  const barcode = row?.barcode ?? header;
  if (row?.plateMap) {
    const m = mapByRef(maps, row.plateMap);
    if (m) return { plateMapId: m.id, barcode, matchedBy: "manifest" };
    return {
      plateMapId: null,
      barcode,
      matchedBy: null,
      message: `manifest, line ${row.line}: no plate map "${row.plateMap.slice(0, 80)}" in this campaign`,
    };
  }
  const tryText = (text: string | null, by: string): Match | null => {
    if (!text) return null;
    // A map is named by its whole name or its first word ("screen-01" of "screen-01 (single-dose)").
    const keys = (m: MapRef) => [m.name, m.name.trim().split(/\s+/)[0] ?? ""].filter((k) => k.length >= 3);
    const hits = maps
      .map((m) => ({
        m,
        len: Math.max(
          0,
          ...keys(m)
            .filter((k) => containsToken(text, k))
            .map((k) => k.length),
        ),
      }))
      .filter((h) => h.len > 0)
      .sort((a, b) => b.len - a.len);
    if (hits.length === 0) return null;
    if (hits.length > 1 && hits[0]!.len === hits[1]!.len)
      return { plateMapId: null, barcode, matchedBy: null, message: `${by} matches more than one plate map` };
    return { plateMapId: hits[0]!.m.id, barcode, matchedBy: by };
  };
  const stem = baseName(fileName).replace(/\.[A-Za-z0-9]{1,5}$/, "");
  const found = tryText(barcode, "barcode") ?? tryText(stem, "file name");
  if (found?.plateMapId) return found;
  if (defaultMapId) return { plateMapId: defaultMapId, barcode, matchedBy: "default" };
  return found ?? { plateMapId: null, barcode, matchedBy: null, message: "no plate map matched; assign one" };
}
