import "server-only";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import {
  compoundBatches,
  compounds,
  hitComments,
  hitRows,
  triageDecisions,
  users,
  type ExperimentSettings,
} from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { ExperimentKind } from "@/lib/analysis/kinds";
import { triageLabels } from "@/lib/hits/query";
import { hitJson, rowColumns } from "./list";

/** Everything the compound panel shows: the row, structure, current results with plot data, batches, history, comments. */
export async function hitDetail(campaignId: string, registryId: string) {
  const [row] = await db
    .select(rowColumns)
    .from(hitRows)
    .where(and(eq(hitRows.campaignId, campaignId), eq(hitRows.compoundId, registryId)));
  if (!row) throw new AppError("not_found", `No result in this campaign for ${registryId}.`);
  const [compound] = await db.select().from(compounds).where(eq(compounds.registryId, registryId));
  const [results, batches, history, comments] = await Promise.all([
    db.execute<{
      kind: ExperimentKind;
      experiment_id: string;
      experiment_name: string;
      settings: ExperimentSettings | null;
      finished_at: string | null;
      n_points: number;
      pct_inhibition: number | null;
      ic50_um: number | null;
      mechanism: string | null;
      flags: string[];
      detail: unknown;
      override_model: string | null;
      override_reason: string | null;
    }>(sql`
      select r.kind, r.experiment_id, e.name as experiment_name, e.settings, a.finished_at, r.n_points, r.pct_inhibition, r.ic50_um, r.mechanism, r.flags, r.detail,
             ov.model as override_model, ov.reason as override_reason
      from compound_results r
      join analyses a on a.id = r.analysis_id and a.is_current
      join experiments e on e.id = r.experiment_id
      left join lateral (select o.model, o.reason from mechanism_overrides o where o.experiment_id = r.experiment_id and o.compound_id = r.compound_id order by o.at desc limit 1) ov on true
      where r.campaign_id = ${campaignId} and r.compound_id = ${registryId}
      order by a.finished_at desc nulls last`),
    compound
      ? db
          .select({
            batchNumber: compoundBatches.batchNumber,
            supplier: compoundBatches.supplier,
            purityPct: compoundBatches.purityPct,
            saltForm: compoundBatches.saltForm,
            batchDate: compoundBatches.batchDate,
          })
          .from(compoundBatches)
          .where(eq(compoundBatches.compoundId, compound.id))
          .orderBy(asc(compoundBatches.batchNumber))
      : Promise.resolve([]),
    db
      .select({
        id: triageDecisions.id,
        from: triageDecisions.fromStatus,
        to: triageDecisions.toStatus,
        comment: triageDecisions.comment,
        at: triageDecisions.at,
        by: users.name,
      })
      .from(triageDecisions)
      .leftJoin(users, eq(users.id, triageDecisions.by))
      .where(and(eq(triageDecisions.campaignId, campaignId), eq(triageDecisions.compoundId, registryId)))
      .orderBy(desc(triageDecisions.at), desc(triageDecisions.id)),
    db
      .select({ id: hitComments.id, body: hitComments.body, at: hitComments.at, by: users.name })
      .from(hitComments)
      .leftJoin(users, eq(users.id, hitComments.by))
      .where(and(eq(hitComments.campaignId, campaignId), eq(hitComments.compoundId, registryId)))
      .orderBy(desc(hitComments.at)),
  ]);
  return {
    row: hitJson(row),
    compound: compound
      ? {
          registryId: compound.registryId,
          name: compound.name,
          smiles: compound.canonicalSmiles,
          formula: compound.formula,
          mw: compound.mwGPerMol,
          clogp: compound.clogp,
          heavyAtoms: compound.heavyAtoms,
          structureKey: compound.structureKey,
        }
      : null,
    results: [...results].map((r) => ({
      kind: r.kind,
      experimentId: r.experiment_id,
      experimentName: r.experiment_name,
      substrateUm: r.settings?.substrateUm ?? null,
      analysedAt: r.finished_at ? new Date(r.finished_at).toISOString() : null,
      nPoints: r.n_points,
      flags: r.flags,
      override: r.override_model ? { model: r.override_model, reason: r.override_reason } : null,
      detail: r.detail,
    })),
    batches: batches.map((b) => ({ ...b, batchDate: b.batchDate ?? null })),
    history: history.map((h) => ({
      ...h,
      at: h.at.toISOString(),
      fromLabel: triageLabels[h.from],
      toLabel: triageLabels[h.to],
    })),
    comments: comments.map((c) => ({ ...c, at: c.at.toISOString() })),
  };
}

/** The structure key of a compound with a hit row in the campaign (for its drawing). */
export async function hitStructureKey(campaignId: string, registryId: string): Promise<string> {
  const [row] = await db
    .select({ key: hitRows.structureKey })
    .from(hitRows)
    .where(and(eq(hitRows.campaignId, campaignId), eq(hitRows.compoundId, registryId)));
  if (!row?.key) throw new AppError("not_found", `No structure for ${registryId} in this campaign.`);
  return row.key;
}
