import { z } from "zod";

/** Multipart fields of POST /api/compound-imports. */
export const importUploadForm = z.object({
  file: z.instanceof(File, { message: "file: attach a CSV, XLSX or SDF file" }),
});
