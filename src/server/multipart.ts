import "server-only";
import type { z } from "zod";
import { AppError } from "./errors";

/**
 * Reads a multipart form for a route handler: refuses a body larger than `maxBytes` from its
 * Content-Length before reading it, then parses the fields (strings, and File for file inputs)
 * with the route's zod schema.
 */
export async function readMultipart<S extends z.ZodType>(
  req: Request,
  schema: S,
  maxBytes: number,
): Promise<z.infer<S>> {
  const declared = Number(req.headers.get("content-length") ?? "0");
  // A little room for the multipart framing and the other fields.
  if (declared > maxBytes + 256 * 1024) {
    throw new AppError(
      "too_large",
      `The upload is ${(declared / 1024 / 1024).toFixed(1)} MB; the limit is ${maxBytes / 1024 / 1024} MB per file.`,
    );
  }
  if (!(req.headers.get("content-type") ?? "").toLowerCase().startsWith("multipart/form-data")) {
    throw new AppError("bad_request", "Send the upload as multipart/form-data.");
  }
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw new AppError("bad_request", "The multipart form could not be read.");
  }
  const raw: Record<string, unknown> = {};
  for (const [k, v] of form.entries()) if (!(k in raw)) raw[k] = v;
  return schema.parse(raw);
}
