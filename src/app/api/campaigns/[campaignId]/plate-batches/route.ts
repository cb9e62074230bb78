import { requireCampaign } from "@/server/auth/guard";
import { json, parseQuery, route } from "@/server/http";
import { readBodyCapped } from "@/server/multipart";
import { AppError } from "@/server/errors";
import { createBatch, getBatch, MAX_BATCH_INFLATED_BYTES } from "@/server/services/plates/batches";
import { PostPlateBatchForm, PostPlateBatchQuery } from "./schema";

export const dynamic = "force-dynamic";

/**
 * A day's plates in one upload (assay scientists and admins). Every file is stored with its
 * SHA-256 and its batch row written before any is parsed; 202 with the batch while files are
 * parsed (poll GET …/plate-batches/{batchId}), or 201 with every outcome when `?wait=true`.
 */
export const POST = route<{ campaignId: string }>(async (req, { campaignId }) => {
  const { user, campaign } = await requireCampaign(campaignId, "plate:write");
  const { wait } = parseQuery(req, PostPlateBatchQuery);
  const contentType = req.headers.get("content-type") ?? "";
  if (!contentType.toLowerCase().startsWith("multipart/form-data"))
    throw new AppError("bad_request", "Send the batch as multipart/form-data (file parts, or one .zip).");
  const body = await readBodyCapped(req, MAX_BATCH_INFLATED_BYTES, "The batch upload");
  let form: FormData;
  try {
    form = await new Response(body, { headers: { "content-type": contentType } }).formData();
  } catch {
    throw new AppError("bad_request", "The multipart form could not be read.");
  }
  const manifest = form.get("manifest");
  const plateMapId = form.get("plateMapId");
  const parsed = PostPlateBatchForm.parse({
    file: form.getAll("file"),
    manifest: manifest === null || manifest === "" ? undefined : manifest,
    plateMapId: plateMapId === null || plateMapId === "" ? undefined : plateMapId,
  });
  const files = await Promise.all(
    parsed.file.map(async (f) => ({ name: f.name, contentType: f.type, bytes: new Uint8Array(await f.arrayBuffer()) })),
  );
  const { id } = await createBatch(
    user,
    campaign,
    {
      files,
      manifest: parsed.manifest ? new Uint8Array(await parsed.manifest.arrayBuffer()) : null,
      defaultPlateMapId: parsed.plateMapId ?? null,
    },
    { wait: wait === "true" },
  );
  return json(await getBatch(campaignId, id), wait === "true" ? 201 : 202);
});
