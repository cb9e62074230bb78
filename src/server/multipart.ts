import "server-only";
import type { z } from "zod";
import { AppError } from "./errors";

const MIB = 1024 * 1024;
/** Room for the multipart framing and the form's other fields beside the file. */
const FRAMING_BYTES = 256 * 1024;

const mb = (n: number) => (n < MIB ? `${Math.ceil(n / 1024)} KB` : `${(n / MIB).toFixed(1)} MB`);

/**
 * Reads a request body into memory, counting the bytes as they arrive and stopping at `maxBytes`:
 * Content-Length may be absent (chunked transfer) or wrong, so it is only used to refuse early.
 * Memory is bounded by the cap; the stream is cancelled when the cap trips.
 */
export async function readBodyCapped(
  req: Request,
  maxBytes: number,
  what = "The request body",
): Promise<Uint8Array<ArrayBuffer>> {
  const tooLarge = (n: number, atLeast: boolean) =>
    new AppError("too_large", `${what} is ${atLeast ? "more than " : ""}${mb(n)}; the limit is ${mb(maxBytes)}.`);
  const declared = Number(req.headers.get("content-length") ?? "");
  if (Number.isFinite(declared) && declared > maxBytes) throw tooLarge(declared, false);
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const parts: Uint8Array[] = [];
  let total = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > maxBytes) {
        await reader.cancel().catch(() => undefined);
        throw tooLarge(maxBytes, true);
      }
      parts.push(value);
    }
  } catch (e) {
    if (e instanceof AppError) throw e;
    throw new AppError("bad_request", `${what} could not be read (the connection ended early).`);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.byteLength;
  }
  return out;
}

/**
 * Reads a multipart form for a route handler: the body is read with the byte cap enforced while
 * it streams in (`maxBytes` per file plus a little framing), then the fields (strings, and File
 * for file inputs) are parsed with the route's zod schema.
 */
export async function readMultipart<S extends z.ZodType>(
  req: Request,
  schema: S,
  maxBytes: number,
): Promise<z.infer<S>> {
  const contentType = req.headers.get("content-type") ?? "";
  if (!contentType.toLowerCase().startsWith("multipart/form-data")) {
    throw new AppError("bad_request", "Send the upload as multipart/form-data.");
  }
  const body = await readBodyCapped(req, maxBytes + FRAMING_BYTES, "The upload");
  let form: FormData;
  try {
    form = await new Response(body, { headers: { "content-type": contentType } }).formData();
  } catch {
    throw new AppError("bad_request", "The multipart form could not be read.");
  }
  const raw: Record<string, unknown> = {};
  for (const [k, v] of form.entries()) if (!(k in raw)) raw[k] = v;
  const parsed = schema.parse(raw);
  for (const v of Object.values(raw))
    if (v instanceof File && v.size > maxBytes)
      throw new AppError(
        "too_large",
        `${v.name.slice(0, 120)}: the file is ${mb(v.size)}; the limit is ${mb(maxBytes)}.`,
      );
  return parsed;
}
