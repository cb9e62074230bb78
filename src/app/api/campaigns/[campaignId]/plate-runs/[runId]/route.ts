import { requireCampaign } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { AppError } from "@/server/errors";
import { getRunDetail } from "@/server/services/plates";
import { runParams } from "./schema";

export const dynamic = "force-dynamic";

/** One run: its file, QC, decision, masks and every well's value, rate and % inhibition (members). */
export const GET = route<{ campaignId: string; runId: string }>(async (_req, params) => {
  await requireCampaign(params.campaignId, "campaign:read");
  const p = runParams.safeParse(params);
  if (!p.success) throw new AppError("not_found", "No such plate run in this campaign.");
  const d = await getRunDetail(p.data.campaignId, p.data.runId);
  const r = d.run;
  return json({
    id: r.id,
    plateMapId: r.plateMapId,
    plateMapName: d.plateMapName,
    barcode: r.barcode,
    file: { name: r.fileName, contentType: r.contentType, sizeBytes: r.sizeBytes, sha256: r.sha256 },
    shape: r.shape,
    format: r.format,
    readout: r.readout,
    reads: r.reads,
    wells: r.wellCount,
    uploadedAt: r.uploadedAt.toISOString(),
    uploadedBy: d.uploadedByName,
    qc: r.qc,
    verdict: r.qcVerdict,
    decision: {
      state: r.decision,
      reason: r.decisionReason,
      by: d.decidedByName,
      at: r.decidedAt?.toISOString() ?? null,
    },
    masks: d.masks.map((m) => ({
      ...m,
      maskedAt: m.maskedAt.toISOString(),
      unmaskedAt: m.unmaskedAt?.toISOString() ?? null,
    })),
    readings: d.readings.map((w) => ({
      well: w.well,
      role: w.role,
      compound: w.compoundId,
      concentrationUm: w.concentrationUm,
      substrateUm: w.substrateUm,
      group: w.replicateGroup,
      value: w.value,
      rateSignalPerS: w.rateSignalPerS,
      rateRSquared: w.rateRSquared,
      rateLinear: w.rateLinear,
      inhibitionPct: w.inhibitionPct,
      masked: w.masked,
    })),
  });
});
