import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { readMultipart } from "@/server/multipart";
import { previewRun, UPLOAD_LIMIT_BYTES } from "@/server/services/plates";
import { uploadRunForm } from "./schema";

export const dynamic = "force-dynamic";

/** Parse a reader export against a plate map and report what was found; nothing is stored. */
export const POST = route<{ campaignId: string }>(async (req, { campaignId }) => {
  const { campaign } = await requireCampaign(campaignId, "plate:write");
  const form = await readMultipart(req, uploadRunForm, UPLOAD_LIMIT_BYTES);
  const bytes = new Uint8Array(await form.file.arrayBuffer());
  return json(await previewRun(campaign, form.plateMapId, form.file.name, bytes));
});
