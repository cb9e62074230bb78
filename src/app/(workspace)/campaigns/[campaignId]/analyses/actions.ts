"use server";
import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/server/action";
import { requireCampaign } from "@/server/auth/guard";
import { createExperiment, requestAnalysis, overrideMechanism } from "@/server/services/analyses";
import { createPlateMap } from "@/server/services/plates";
import { planMechanismStudy } from "@/lib/analysis/planner";
import { plateMapFromWells } from "@/lib/plates";
import { EXPERIMENT_KINDS } from "@/lib/analysis/kinds";
import { INHIBITION_MODELS } from "@/lib/kinetics";
import { campaignKmUm } from "@/lib/units";

const optPos = z.preprocess(
  (v) => (v === "" || v === undefined ? undefined : v),
  z.coerce.number().finite().positive().optional(),
);
const optNum = z.preprocess(
  (v) => (v === "" || v === undefined ? undefined : v),
  z.coerce.number().finite().optional(),
);

const createSchema = z.object({
  campaignId: z.string().uuid(),
  name: z.string().trim().min(1, "Name the experiment.").max(120),
  kind: z.enum(EXPERIMENT_KINDS),
  runIds: z.preprocess(
    (v) => (v === undefined ? [] : Array.isArray(v) ? v : [v]),
    z.array(z.string().uuid()).min(1, "Choose at least one plate run."),
  ),
  hitRule: z.enum(["threshold", "sd", "robust"]).default("threshold"),
  hitThresholdPct: optNum,
  hitK: optPos,
  substrateUm: optPos,
  fixTopPct: optNum,
  fixBottomPct: optNum,
  weighting: z.enum(["none", "relative"]).default("none"),
});

export const createExperimentAction = formAction(createSchema, async (f) => {
  const { user, campaign } = await requireCampaign(f.campaignId, "analysis:run");
  const hitRule =
    f.kind !== "single-dose"
      ? undefined
      : f.hitRule === "threshold"
        ? f.hitThresholdPct !== undefined
          ? { kind: "threshold" as const, thresholdPct: f.hitThresholdPct }
          : undefined
        : { kind: f.hitRule, k: f.hitK ?? 3 };
  const { id } = await createExperiment(user, campaign, {
    name: f.name,
    kind: f.kind,
    runIds: f.runIds,
    settings: {
      ...(hitRule ? { hitRule } : {}),
      ...(f.kind === "dose-response"
        ? { substrateUm: f.substrateUm ?? null, fixTopPct: f.fixTopPct ?? null, fixBottomPct: f.fixBottomPct ?? null }
        : {}),
      ...(f.kind === "mechanism" ? { weighting: f.weighting } : {}),
    },
  });
  revalidatePath(`/campaigns/${f.campaignId}/analyses`);
  redirect(`/campaigns/${f.campaignId}/analyses/${id}`);
});

export const startAnalysisAction = formAction(
  z.object({ campaignId: z.string().uuid(), experimentId: z.string().uuid() }),
  async ({ campaignId, experimentId }) => {
    const { user, campaign } = await requireCampaign(campaignId, "analysis:run");
    const a = await requestAnalysis(user, campaign, experimentId);
    revalidatePath(`/campaigns/${campaignId}/analyses/${experimentId}`);
    return {
      ok: true,
      data: { analysisId: a.id, status: a.status },
      message: a.reused ? "Nothing changed since the current analysis: its results stand." : "Analysis started.",
    };
  },
);

export const overrideMechanismAction = formAction(
  z.object({
    campaignId: z.string().uuid(),
    experimentId: z.string().uuid(),
    compoundId: z.string().min(1).max(40),
    model: z.enum(INHIBITION_MODELS),
    reason: z.string().trim().min(5, "Give a reason of at least a few words.").max(500),
  }),
  async ({ campaignId, experimentId, compoundId, model, reason }) => {
    const { user } = await requireCampaign(campaignId, "analysis:override");
    await overrideMechanism(user, campaignId, experimentId, compoundId, model, reason);
    revalidatePath(`/campaigns/${campaignId}/analyses/${experimentId}`, "layout");
    return { ok: true, message: `Mechanism set to ${model} (override recorded).` };
  },
);

export const planMechanismPlateAction = formAction(
  z.object({
    campaignId: z.string().uuid(),
    compoundId: z.string().min(1).max(40),
    ic50Um: z.coerce.number().finite().positive("IC50 must be positive."),
    kmUm: optPos,
    assaySubstrateUm: optPos,
    format: z.coerce.number().pipe(z.union([z.literal(96), z.literal(384), z.literal(1536)])),
    name: z.string().trim().min(1).max(120),
  }),
  async (f) => {
    const { user, campaign } = await requireCampaign(f.campaignId, "plate:write");
    const kmUm = f.kmUm ?? campaignKmUm(campaign);
    if (!kmUm)
      return {
        ok: false,
        error: "Set the target's Km (in the campaign or here) to plan a mechanism study.",
        status: 400,
      };
    const plan = planMechanismStudy({
      compound: f.compoundId,
      ic50Um: f.ic50Um,
      kmUm,
      assaySubstrateUm: f.assaySubstrateUm,
      format: f.format,
    });
    const { id } = await createPlateMap(user, f.campaignId, {
      name: f.name,
      map: plateMapFromWells(plan.format, plan.wells),
    });
    redirect(`/campaigns/${f.campaignId}/plates/maps/${id}`);
  },
);
