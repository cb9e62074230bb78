"use server";
import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/server/action";
import { requireCampaign } from "@/server/auth/guard";
import {
  createExperiment,
  experimentRunList,
  getExperiment,
  overrideMechanism,
  planMechanismPlate,
  requestAnalysis,
} from "@/server/services/analyses";
import { changeMasks } from "@/server/services/plates";
import { EXPERIMENT_KINDS } from "@/lib/analysis/kinds";
import { INHIBITION_MODELS } from "@/lib/kinetics";
import { ANALYSIS_WEIGHTINGS, DEFAULT_ANALYSIS_WEIGHTING } from "@/lib/analysis/settings";

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
  weighting: z.enum(ANALYSIS_WEIGHTINGS).default(DEFAULT_ANALYSIS_WEIGHTING),
  robust: z.enum(["on", ""]).optional(),
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
      ...(f.kind !== "single-dose" ? { weighting: f.weighting, robust: f.robust === "on" } : {}),
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
    const { id } = await planMechanismPlate(user, campaign, {
      compoundId: f.compoundId,
      ic50Um: f.ic50Um,
      kmUm: f.kmUm,
      assaySubstrateUm: f.assaySubstrateUm,
      format: f.format,
      name: f.name,
    });
    redirect(`/campaigns/${f.campaignId}/plates/maps/${id}`);
  },
);

const maskEdit = z.strictObject({
  runId: z.string().uuid(),
  well: z.string().trim().min(2).max(4),
  masked: z.boolean(),
  reason: z
    .string()
    .trim()
    .min(3, "give a reason (at least 3 characters)")
    .max(500, "a reason has at most 500 characters"),
});

/**
 * Store the wells a scientist excluded from (or restored to) a result's fit on the page, as the
 * runs' audited well masks, all in one transaction. The masks change the experiment's inputs, so
 * the next analysis uses them; the current results stay as they are until then.
 */
export const saveCurationAction = formAction(
  z.object({
    campaignId: z.string().uuid(),
    experimentId: z.string().uuid(),
    compoundId: z.string().min(1).max(40),
    /** JSON: [{runId, well, masked, reason}] */
    edits: z.string().min(2).max(200_000),
  }),
  async ({ campaignId, experimentId, compoundId, edits }) => {
    const { user } = await requireCampaign(campaignId, "plate:write");
    let raw: unknown;
    try {
      raw = JSON.parse(edits);
    } catch {
      return { ok: false, error: "The list of changes could not be read.", status: 400 };
    }
    const parsed = z.array(maskEdit).min(1, "Nothing to save.").max(400).safeParse(raw);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const at = typeof issue?.path[0] === "number" ? `Change ${issue.path[0] + 1}: ` : "";
      const field = issue && issue.path.length > 1 ? `${String(issue.path[1])} — ` : "";
      return { ok: false, error: `${at}${field}${issue?.message ?? "invalid"}.`, status: 400 };
    }
    await getExperiment(campaignId, experimentId);
    const runs = new Set((await experimentRunList(experimentId)).map((r) => r.id));
    const stray = parsed.data.find((e) => !runs.has(e.runId));
    if (stray) return { ok: false, error: `Well ${stray.well} is on a run outside this experiment.`, status: 400 };
    await changeMasks(user, campaignId, parsed.data, { compoundId });
    revalidatePath(`/campaigns/${campaignId}/analyses/${experimentId}`, "layout");
    revalidatePath(`/campaigns/${campaignId}/plates`, "layout");
    const n = parsed.data.length;
    return {
      ok: true,
      message: `${n} ${n === 1 ? "change" : "changes"} saved as audited well masks. The results shown were computed before ${n === 1 ? "it" : "them"}: run the analysis to use ${n === 1 ? "it" : "them"}.`,
    };
  },
);
