import { requireCapabilityAnywhere } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { readMultipart } from "@/server/multipart";
import { importView, startImport } from "@/server/services/compounds";
import { MAX_IMPORT_BYTES } from "@/lib/chem/import-types";
import { importUploadForm } from "./schema";

export const dynamic = "force-dynamic";

/**
 * Upload a bulk-import file (chemists, admins). The file is stored with its SHA-256 first; 202
 * with the job, which is prepared in the background (poll GET /api/compound-imports/{id}).
 */
export const POST = route(async (req) => {
  const user = await requireCapabilityAnywhere("compound:write");
  const form = await readMultipart(req, importUploadForm, MAX_IMPORT_BYTES);
  const bytes = new Uint8Array(await form.file.arrayBuffer());
  const { job } = await startImport(user, { fileName: form.file.name, contentType: form.file.type, bytes });
  return json(importView(job), 202);
});
