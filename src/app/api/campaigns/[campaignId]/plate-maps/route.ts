import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { readMultipart } from "@/server/multipart";
import { AppError } from "@/server/errors";
import { createPlateMap, listPlateMaps, readPlateMapCsv } from "@/server/services/plates";
import { createPlateMapForm } from "./schema";

export const dynamic = "force-dynamic";

const MAP_CSV_LIMIT = 2 * 1024 * 1024;

/** Plate maps of the campaign (members). */
export const GET = route<{ campaignId: string }>(async (_req, { campaignId }) => {
  await requireCampaign(campaignId, "campaign:read");
  const items = await listPlateMaps(campaignId);
  return json({ items: items.map((m) => ({ ...m, updatedAt: m.updatedAt.toISOString() })) });
});

/** Import a plate map from CSV (assay scientists and admins): 201 {id}; 400 with line/well details. */
export const POST = route<{ campaignId: string }>(async (req, { campaignId }) => {
  const { user } = await requireCampaign(campaignId, "plate:write");
  const form = await readMultipart(req, createPlateMapForm, MAP_CSV_LIMIT);
  if (form.file.size > MAP_CSV_LIMIT)
    throw new AppError("too_large", `${form.file.name}: a plate map CSV has at most 2 MB.`);
  const map = await readPlateMapCsv(new Uint8Array(await form.file.arrayBuffer()), form.format, form.file.name);
  const { id } = await createPlateMap(user, campaignId, {
    name: form.name,
    map,
    isTemplate: form.template,
    signalDirection: form.signalDirection,
  });
  return json({ id }, 201);
});
