import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { readMultipart } from "@/server/multipart";
import { AppError } from "@/server/errors";
import { createPlateMap, issueDetails, listPlateMaps } from "@/server/services/plates";
import { parsePlateMapCsv } from "@/lib/plates";
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
  const parsed = parsePlateMapCsv(new Uint8Array(await form.file.arrayBuffer()), form.format, form.file.name);
  if (!parsed.ok) {
    const more = parsed.issues.length > 1 ? ` (and ${parsed.issues.length - 1} more)` : "";
    throw new AppError("bad_request", `${parsed.issues[0]!.text}${more}`, { details: issueDetails(parsed.issues) });
  }
  const { id } = await createPlateMap(user, campaignId, {
    name: form.name,
    map: parsed.map,
    isTemplate: form.template,
    signalDirection: form.signalDirection,
  });
  return json({ id }, 201);
});
