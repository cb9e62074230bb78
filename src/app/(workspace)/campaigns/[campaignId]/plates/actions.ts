"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/server/action";
import { requireCampaign } from "@/server/auth/guard";
import {
  createPlateMap,
  decideRun,
  issueDetails,
  maskWell,
  readPlateMapJson,
  unmaskWell,
  updatePlateMap,
} from "@/server/services/plates";
import { REVIEW_DECISIONS, SIGNAL_DIRECTIONS } from "@/lib/plates/run-qc";

const id = z.string().uuid();
const reason = z
  .string()
  .trim()
  .min(3, "Give a reason (at least 3 characters).")
  .max(500, "A reason has at most 500 characters.");

const saveMapSchema = z.object({
  campaignId: id,
  mapId: z.union([id, z.literal("")]).optional(),
  name: z.string().trim().min(1, "Give the plate map a name.").max(120),
  template: z.enum(["on", "1", "0", ""]).optional(),
  signalDirection: z.enum(SIGNAL_DIRECTIONS).default("falls"),
  /** {"format": 96|384|1536, "wells": PlateMapWell[] (non-empty wells)} from the editor */
  mapJson: z.string().min(2).max(900_000),
});

/** Save the plate map from the editor (new, or an existing one no run has used). */
export const savePlateMapAction = formAction(saveMapSchema, async (input) => {
  const { user } = await requireCampaign(input.campaignId, "plate:write");
  const parsed = await readPlateMapJson(input.mapJson);
  if (!parsed.ok) {
    const d = issueDetails(parsed.issues);
    return {
      ok: false,
      error:
        parsed.issues
          .slice(0, 5)
          .map((i) => i.text)
          .join("; ") + (d.length > 5 ? ` (and ${d.length - 5} more)` : ""),
      status: 400,
    };
  }
  const data = {
    name: input.name,
    map: parsed.map,
    isTemplate: input.template === "on" || input.template === "1",
    signalDirection: input.signalDirection,
  };
  const { id: mapId } = input.mapId
    ? await updatePlateMap(user, input.campaignId, input.mapId, data)
    : await createPlateMap(user, input.campaignId, data);
  revalidatePath(`/campaigns/${input.campaignId}/plates`, "layout");
  return { ok: true, data: { id: mapId }, message: "Plate map saved." };
});

const maskSchema = z.object({ campaignId: id, runId: id, well: z.string().trim().min(2).max(4), reason });

/** Mask a well with a reason (audited); QC and % inhibition are recomputed. */
export const maskWellAction = formAction(maskSchema, async ({ campaignId, runId, well, reason: why }) => {
  const { user } = await requireCampaign(campaignId, "plate:write");
  const qc = await maskWell(user, campaignId, runId, well, why);
  revalidatePath(`/campaigns/${campaignId}/plates`, "layout");
  return {
    ok: true,
    message: `Well ${well.toUpperCase()} masked. QC recomputed: Z′ ${qc.zPrime?.toFixed(2) ?? "—"}, ${qc.verdict}.`,
  };
});

/** Unmask a well with a reason (audited); QC and % inhibition are recomputed. */
export const unmaskWellAction = formAction(maskSchema, async ({ campaignId, runId, well, reason: why }) => {
  const { user } = await requireCampaign(campaignId, "plate:write");
  const qc = await unmaskWell(user, campaignId, runId, well, why);
  revalidatePath(`/campaigns/${campaignId}/plates`, "layout");
  return {
    ok: true,
    message: `Well ${well.toUpperCase()} unmasked. QC recomputed: Z′ ${qc.zPrime?.toFixed(2) ?? "—"}, ${qc.verdict}.`,
  };
});

const decideSchema = z.object({ campaignId: id, runId: id, decision: z.enum(REVIEW_DECISIONS), reason });

/** Accept or reject a run's QC with a reason (audited). */
export const decideRunAction = formAction(decideSchema, async ({ campaignId, runId, decision, reason: why }) => {
  const { user } = await requireCampaign(campaignId, "plate:write");
  await decideRun(user, campaignId, runId, decision, why);
  revalidatePath(`/campaigns/${campaignId}/plates`, "layout");
  return { ok: true, message: decision === "accepted" ? "Run accepted." : "Run rejected." };
});
