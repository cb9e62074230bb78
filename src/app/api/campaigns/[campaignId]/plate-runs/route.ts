import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { readMultipart } from "@/server/multipart";
import { listRuns, UPLOAD_LIMIT_BYTES, uploadRun } from "@/server/services/plates";
import { uploadRunForm } from "./schema";

export const dynamic = "force-dynamic";

/** Plate runs of the campaign with their QC (members). */
export const GET = route<{ campaignId: string }>(async (_req, { campaignId }) => {
  await requireCampaign(campaignId, "campaign:read");
  const items = await listRuns(campaignId);
  return json({
    items: items.map((r) => ({
      id: r.id,
      fileName: r.fileName,
      barcode: r.barcode,
      plateMapId: r.plateMapId,
      plateMapName: r.plateMapName,
      readout: r.readout,
      reads: r.reads,
      wells: r.wellCount,
      zPrime: r.zPrime,
      verdict: r.qcVerdict,
      decision: r.decision,
      uploadedAt: r.uploadedAt.toISOString(),
    })),
  });
});

/**
 * Upload a reader export for a plate map (assay scientists and admins). 201 with the run's QC;
 * 409 with `runId` when the same file was uploaded before; 400 with line/well details.
 */
export const POST = route<{ campaignId: string }>(async (req, { campaignId }) => {
  const { user, campaign } = await requireCampaign(campaignId, "plate:write");
  const form = await readMultipart(req, uploadRunForm, UPLOAD_LIMIT_BYTES);
  const bytes = new Uint8Array(await form.file.arrayBuffer());
  const run = await uploadRun(user, campaign, {
    plateMapId: form.plateMapId,
    fileName: form.file.name,
    contentType: form.file.type,
    bytes,
    barcode: form.barcode ?? null,
  });
  return json(run, 201);
});
