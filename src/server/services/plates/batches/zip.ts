import "server-only";
import JSZip from "jszip";
import { guardXlsxZip } from "@/server/workers/zip-guard";
import { AppError } from "@/server/errors";
import { MAX_FILE_BYTES } from "@/lib/plates/reader-export";

const MIB = 1024 * 1024;
/** Files in one batch: a screening day is tens of plates; 200 leaves room (chosen here). */
export const MAX_BATCH_FILES = 200;
/** Bytes a batch zip may inflate to, counted as it inflates (chosen here: 200 files of well under 1 MB each). */
export const MAX_BATCH_INFLATED_BYTES = 128 * MIB;
/**
 * Inflated ÷ compressed bytes of the whole zip. Reader CSVs compress 5–20× (measured here on the
 * bench's invented exports: about 6×); a zip bomb is 1000× or more (chosen here).
 */
export const MAX_BATCH_RATIO = 200;

export type UnpackedFile = { name: string; bytes: Uint8Array };

/** An entry name that could reach outside a folder if someone wrote it to disk, or is no file at all. */
function unsafePath(name: string): boolean {
  return (
    name.startsWith("/") ||
    name.startsWith("\\") ||
    /^[A-Za-z]:/.test(name) ||
    name.split(/[\\/]/).some((part) => part === "..") ||
    [...name].some((ch) => ch.charCodeAt(0) < 32)
  );
}

/** Folders, macOS resource forks and hidden files are not reader exports. */
const ignored = (name: string) =>
  name.endsWith("/") || name.startsWith("__MACOSX/") || (name.split("/").pop() ?? "").startsWith(".");

/**
 * Unpacks a batch zip with every check before anything is extracted: the zip guard
 * (src/server/workers/zip-guard.ts) walks the central directory, refuses more than its entry cap,
 * inflates each entry as a stream counting the bytes that come out (declared sizes can lie) and
 * checks each CRC-32, keeping nothing; then the ratio, the entry names (no absolute paths, no
 * `..`, no control characters) and the file count are checked; only then does jszip extract.
 */
export async function unpackBatchZip(zipName: string, bytes: Uint8Array): Promise<UnpackedFile[]> {
  const refuse = (why: string) =>
    new AppError("bad_request", `${zipName}: ${why}`, { details: [{ field: "file", message: `${zipName}: ${why}` }] });
  const g = await guardXlsxZip(bytes, {
    maxInflatedBytes: MAX_BATCH_INFLATED_BYTES,
    maxRows: Number.POSITIVE_INFINITY,
    maxColumns: Number.POSITIVE_INFINITY,
  });
  if (!g.ok) throw refuse(g.message.replace(/XLSX workbook/g, "zip archive").replace(/^workbook/, "the archive"));
  if (bytes.byteLength > 0 && g.inflatedBytes / bytes.byteLength > MAX_BATCH_RATIO)
    throw refuse(
      `the archive inflates ${Math.round(g.inflatedBytes / bytes.byteLength)}× its size; more than ${MAX_BATCH_RATIO}× is refused as a likely zip bomb`,
    );
  let zip: JSZip;
  try {
    zip = await JSZip.loadAsync(bytes, { checkCRC32: false });
  } catch {
    throw refuse("the archive could not be read as a zip");
  }
  const names = Object.keys(zip.files);
  // jszip tidies "../" out of names on load and keeps the name as written in `unsafeOriginalName`.
  const raw = (n: string) => zip.files[n]!.unsafeOriginalName ?? n;
  // Name a file entry rather than a folder the archiver added on the way.
  const bad = names.find((n) => unsafePath(raw(n)) && !zip.files[n]!.dir) ?? names.find((n) => unsafePath(raw(n)));
  if (bad)
    throw refuse(
      `entry "${raw(bad)
        .slice(0, 80)
        .replace(/[\u0000-\u001f]/g, "?")}" has an unsafe path (absolute, with "..", or control characters)`,
    );
  const wanted = names.filter((n) => !zip.files[n]!.dir && !ignored(n));
  if (wanted.length === 0) throw refuse("the archive holds no files");
  if (wanted.length > MAX_BATCH_FILES)
    throw refuse(`the archive holds ${wanted.length} files; a batch has at most ${MAX_BATCH_FILES}`);
  const out: UnpackedFile[] = [];
  for (const n of wanted) {
    const data = await zip.files[n]!.async("uint8array");
    if (data.byteLength > MAX_FILE_BYTES)
      throw refuse(
        `${n.slice(0, 80)} is ${(data.byteLength / MIB).toFixed(1)} MB; the limit is ${MAX_FILE_BYTES / MIB} MB per file`,
      );
    out.push({ name: n, bytes: data });
  }
  return out;
}

export const isZipName = (name: string, bytes: Uint8Array) =>
  /\.zip$/i.test(name) && bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b;
