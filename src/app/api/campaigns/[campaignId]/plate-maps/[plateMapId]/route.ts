import type { z } from "zod";
import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { AppError } from "@/server/errors";
import { deletePlateMap, issueDetails, plateMapWithUse, updatePlateMap } from "@/server/services/plates";
import { plateMapFromJson, plateMapFromWells } from "@/lib/plates";
import { PatchPlateMapBody, type GetPlateMapResponse } from "./schema";

export const dynamic = "force-dynamic";

type Params = { campaignId: string; plateMapId: string };

async function answer(campaignId: string, plateMapId: string): Promise<z.infer<typeof GetPlateMapResponse>> {
  const m = await plateMapWithUse(campaignId, plateMapId);
  return {
    id: m.id,
    name: m.name,
    format: m.format,
    isTemplate: m.isTemplate,
    signalDirection: m.signalDirection,
    sampleWells: m.sampleWells,
    neutralWells: m.neutralWells,
    fullWells: m.fullWells,
    runs: m.runs,
    updatedAt: m.updatedAt.toISOString(),
    wells: m.wells,
  };
}

/** One plate map with its layout (members). */
export const GET = route<Params>(async (_req, { campaignId, plateMapId }) => {
  await requireCampaign(campaignId, "campaign:read");
  return json(await answer(campaignId, plateMapId));
});

/**
 * Change a plate map no run uses yet (assay scientists and admins; audited): the same service as
 * the editor. 400 with the wells at fault; 409 when runs use it (copy it instead).
 */
export const PATCH = route<Params>(async (req, { campaignId, plateMapId }) => {
  const { user } = await requireCampaign(campaignId, "plate:write");
  const body = await parseJson(req, PatchPlateMapBody);
  const old = await plateMapWithUse(campaignId, plateMapId);
  let map = plateMapFromWells(old.format, old.wells);
  if (body.wells !== undefined) {
    const parsed = plateMapFromJson({ format: old.format, wells: body.wells });
    if (!parsed.ok) {
      const more = parsed.issues.length > 1 ? ` (and ${parsed.issues.length - 1} more)` : "";
      throw new AppError("bad_request", `${parsed.issues[0]!.text}${more}`, { details: issueDetails(parsed.issues) });
    }
    map = parsed.map;
  }
  await updatePlateMap(user, campaignId, plateMapId, {
    name: body.name ?? old.name,
    map,
    isTemplate: body.template,
    signalDirection: body.signalDirection,
  });
  return json(await answer(campaignId, plateMapId));
});

/** Delete a plate map no run uses (assay scientists and admins; audited): 204; 409 with a sentence when runs use it. */
export const DELETE = route<Params>(async (_req, { campaignId, plateMapId }) => {
  const { user } = await requireCampaign(campaignId, "plate:write");
  await deletePlateMap(user, campaignId, plateMapId);
  return new Response(null, { status: 204 });
});
