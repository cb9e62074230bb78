import "server-only";
import { and, asc, desc, eq, getTableColumns, inArray, sql, type SQL, type SQLWrapper } from "drizzle-orm";
import { db, type Db, type Tx } from "@/server/db/client";
import {
  compoundBatches,
  compounds,
  hitComments,
  hitRows,
  hitRowVersions,
  hitViews,
  triageDecisions,
  users,
} from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { SessionUser } from "@/server/auth/session";
import { audit } from "./audit";
import type { HitItem } from "@/lib/hits/item";
import {
  rangeFields,
  triageLabels,
  type HitFilter,
  type SavedViewState,
  type SortField,
  type TriageStatus,
} from "@/lib/hits/query";

type Actor = Pick<SessionUser, "id" | "email">;

// ---------------------------------------------------------------- refresh

/**
 * Recomputes the hit rows of the given compounds in a campaign from the current analyses
 * (`analyses.is_current`), inside the caller's transaction, so the grid never disagrees with
 * the results, overrides, decisions and comments committed with it. One statement:
 *
 * - single-dose: the latest current result's % inhibition and hit call;
 * - dose-response: the latest current IC50 (95 % CI, qualifier) and Hill slope;
 * - mechanism: the latest current call, or the latest override (Ki then comes from the
 *   overriding model's fit: Kiu for uncompetitive, Kic otherwise, as on the result page);
 * - flags: the union over every current result; `flagged` = any flag or an ambiguous call;
 * - pKi = 6 − log10(Ki/µM), LE = 1.37·pKi/heavy atoms, LipE = pKi − cLogP (the definitions in
 *   src/lib/hits/efficiency.ts, written again in SQL so Postgres can sort and filter on them);
 * - status and owner: the latest triage decision (who made it), else unreviewed;
 * - last tested: the latest upload among the runs the current analyses were computed from.
 *
 * Compounds with no current result lose their row (their decisions and comments stay). With
 * `prune`, every row of the campaign without a current result goes (a re-analysis that drops
 * a compound).
 */
export async function refreshHitRows(
  tx: Tx,
  campaignId: string,
  compoundIds: readonly string[],
  opts: { prune?: boolean } = {},
): Promise<void> {
  const ids = [...new Set(compoundIds)];
  if (ids.length > 0) {
    const idArray = sql`${`{${ids.map((i) => `"${i.replace(/["\\]/g, "")}"`).join(",")}}`}::text[]`;
    await tx.execute(sql`
      with cur as (
        select r.*, a.finished_at, a.inputs
        from compound_results r join analyses a on a.id = r.analysis_id and a.is_current
        where r.campaign_id = ${campaignId} and r.compound_id = any(${idArray})
      ),
      sd as (
        select distinct on (compound_id) compound_id, pct_inhibition, hit
        from cur where kind = 'single-dose' order by compound_id, finished_at desc nulls last
      ),
      dr as (
        select distinct on (compound_id) compound_id, ic50_um, ic50_lo_um, ic50_hi_um, ic50_qualifier, hill
        from cur where kind = 'dose-response' order by compound_id, finished_at desc nulls last
      ),
      mo as (
        select distinct on (cur.compound_id) cur.compound_id, cur.mechanism, cur.mechanism_label, cur.ki_um, cur.ki_lo_um, cur.ki_hi_um,
               cur.kic_um, cur.kiu_um, cur.alpha, cur.detail, ov.model as override_model
        from cur
        left join lateral (
          select o.model from mechanism_overrides o where o.experiment_id = cur.experiment_id and o.compound_id = cur.compound_id order by o.at desc limit 1
        ) ov on true
        where cur.kind = 'mechanism' order by cur.compound_id, cur.finished_at desc nulls last
      ),
      mech as (
        select compound_id,
               coalesce(override_model, mechanism) as mechanism,
               case when override_model is null then mechanism_label else 'override' end as mechanism_label,
               override_model is not null and override_model is distinct from mechanism as overridden,
               case when override_model is null then ki_um
                    else (detail->'models'->override_model->>(case when override_model = 'uncompetitive' then 'kiuUm' else 'kicUm' end))::float8 end as ki_um,
               case when override_model is null then ki_lo_um
                    else (detail->'models'->override_model->'ci95'->(case when override_model = 'uncompetitive' then 'kiu' else 'kic' end)->>0)::float8 end as ki_lo_um,
               case when override_model is null then ki_hi_um
                    else (detail->'models'->override_model->'ci95'->(case when override_model = 'uncompetitive' then 'kiu' else 'kic' end)->>1)::float8 end as ki_hi_um,
               case when override_model is null then kic_um else (detail->'models'->override_model->>'kicUm')::float8 end as kic_um,
               case when override_model is null then kiu_um else (detail->'models'->override_model->>'kiuUm')::float8 end as kiu_um,
               case when override_model is null then alpha else (detail->'models'->override_model->>'alpha')::float8 end as alpha
        from mo
      ),
      fl as (
        select cur.compound_id, array_agg(distinct f order by f) filter (where f is not null) as flags
        from cur left join lateral unnest(cur.flags) f on true group by cur.compound_id
      ),
      lt as (
        select cur.compound_id, max(pr.uploaded_at) as last_tested
        from cur
        cross join lateral jsonb_array_elements(cur.inputs->'runs') run
        join plate_runs pr on pr.id = (run->>'id')::uuid
        where exists (select 1 from well_readings w where w.run_id = pr.id and w.compound_id = cur.compound_id)
        group by cur.compound_id
      ),
      base as (
        select fl.compound_id, fl.flags, sd.pct_inhibition, sd.hit, dr.ic50_um, dr.ic50_lo_um, dr.ic50_hi_um, dr.ic50_qualifier, dr.hill,
               mech.mechanism, mech.mechanism_label, coalesce(mech.overridden, false) as overridden, mech.ki_um, mech.ki_lo_um, mech.ki_hi_um,
               mech.kic_um, mech.kiu_um, mech.alpha, lt.last_tested,
               case when mech.ki_um > 0 then 6 - log(mech.ki_um) end as p_ki,
               c.name, c.structure_key, c.mw_g_per_mol, c.clogp, c.heavy_atoms
        from fl
        left join sd on sd.compound_id = fl.compound_id
        left join dr on dr.compound_id = fl.compound_id
        left join mech on mech.compound_id = fl.compound_id
        left join lt on lt.compound_id = fl.compound_id
        left join compounds c on c.registry_id = fl.compound_id
      ),
      dec as (
        select distinct on (d.compound_id) d.compound_id, d.to_status, d.by, d.at, u.name as owner_name
        from triage_decisions d left join users u on u.id = d.by
        where d.campaign_id = ${campaignId} and d.compound_id = any(${idArray})
        order by d.compound_id, d.at desc, d.id desc
      ),
      com as (
        select compound_id, count(*)::int as n from hit_comments
        where campaign_id = ${campaignId} and compound_id = any(${idArray}) group by compound_id
      )
      insert into hit_rows (campaign_id, compound_id, name, structure_key, pct_inhibition, hit, ic50_um, ic50_lo_um, ic50_hi_um, ic50_qualifier, hill,
                            mechanism, mechanism_label, mechanism_overridden, ki_um, ki_lo_um, ki_hi_um, kic_um, kiu_um, alpha, flags, flagged,
                            p_ki, le, lipe, mw_g_per_mol, clogp, heavy_atoms, status, owner_id, owner_name, status_changed_at, last_tested_at,
                            comment_count, ki_first_at, refreshed_at)
      select ${campaignId}, b.compound_id, b.name, b.structure_key, b.pct_inhibition, b.hit, b.ic50_um, b.ic50_lo_um, b.ic50_hi_um, b.ic50_qualifier, b.hill,
             b.mechanism, b.mechanism_label, b.overridden, b.ki_um, b.ki_lo_um, b.ki_hi_um, b.kic_um, b.kiu_um, b.alpha,
             coalesce(b.flags, '{}'), coalesce(cardinality(b.flags), 0) > 0 or coalesce(b.mechanism_label = 'ambiguous', false),
             b.p_ki, case when b.heavy_atoms > 0 then 1.37 * b.p_ki / b.heavy_atoms end, b.p_ki - b.clogp,
             b.mw_g_per_mol, b.clogp, b.heavy_atoms, coalesce(dec.to_status, 'unreviewed'), dec.by, dec.owner_name, dec.at, b.last_tested,
             coalesce(com.n, 0), case when b.ki_um is not null then now() end, now()
      from base b
      left join dec on dec.compound_id = b.compound_id
      left join com on com.compound_id = b.compound_id
      on conflict (campaign_id, compound_id) do update set
        name = excluded.name, structure_key = excluded.structure_key, pct_inhibition = excluded.pct_inhibition, hit = excluded.hit,
        ic50_um = excluded.ic50_um, ic50_lo_um = excluded.ic50_lo_um, ic50_hi_um = excluded.ic50_hi_um, ic50_qualifier = excluded.ic50_qualifier,
        hill = excluded.hill, mechanism = excluded.mechanism, mechanism_label = excluded.mechanism_label, mechanism_overridden = excluded.mechanism_overridden,
        ki_um = excluded.ki_um, ki_lo_um = excluded.ki_lo_um, ki_hi_um = excluded.ki_hi_um, kic_um = excluded.kic_um, kiu_um = excluded.kiu_um,
        alpha = excluded.alpha, flags = excluded.flags, flagged = excluded.flagged, p_ki = excluded.p_ki, le = excluded.le, lipe = excluded.lipe,
        mw_g_per_mol = excluded.mw_g_per_mol, clogp = excluded.clogp, heavy_atoms = excluded.heavy_atoms, status = excluded.status,
        owner_id = excluded.owner_id, owner_name = excluded.owner_name, status_changed_at = excluded.status_changed_at,
        last_tested_at = excluded.last_tested_at, comment_count = excluded.comment_count,
        ki_first_at = case when excluded.ki_um is null then null else coalesce(hit_rows.ki_first_at, excluded.ki_first_at) end,
        refreshed_at = excluded.refreshed_at`);
    await tx.execute(sql`
      delete from hit_rows h where h.campaign_id = ${campaignId} and h.compound_id = any(${idArray})
        and not exists (select 1 from compound_results r join analyses a on a.id = r.analysis_id and a.is_current
                        where r.campaign_id = h.campaign_id and r.compound_id = h.compound_id)`);
  }
  if (opts.prune) {
    await tx.execute(sql`
      delete from hit_rows h where h.campaign_id = ${campaignId}
        and not exists (select 1 from compound_results r join analyses a on a.id = r.analysis_id and a.is_current
                        where r.campaign_id = h.campaign_id and r.compound_id = h.compound_id)`);
  }
  await bumpHitVersion(tx, campaignId);
}

/** Tells every server process that the campaign's hit rows changed (their cached totals are dropped). */
export async function bumpHitVersion(tx: Tx | Db, campaignId: string): Promise<void> {
  await tx.execute(sql`
    insert into hit_row_versions (campaign_id, version) values (${campaignId}, 1)
    on conflict (campaign_id) do update set version = hit_row_versions.version + 1`);
}

// ---------------------------------------------------------------- query

const sortColumn: Record<Exclude<SortField, "default">, SQLWrapper> = {
  registryId: hitRows.compoundId,
  mechanism: hitRows.mechanism,
  ki: hitRows.kiUm,
  kic: hitRows.kicUm,
  kiu: hitRows.kiuUm,
  alpha: hitRows.alpha,
  ic50: hitRows.ic50Um,
  hill: hitRows.hill,
  pctInhibition: hitRows.pctInhibition,
  le: hitRows.le,
  lipe: hitRows.lipe,
  mw: hitRows.mwGPerMol,
  clogp: hitRows.clogp,
  heavyAtoms: hitRows.heavyAtoms,
  flags: hitRows.flagged,
  status: hitRows.status,
  owner: hitRows.ownerName,
  lastTested: hitRows.lastTestedAt,
  comments: hitRows.commentCount,
};

const likeEscape = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

function whereOf(campaignId: string, f: HitFilter): SQL {
  const parts: SQL[] = [sql`${hitRows.campaignId} = ${campaignId}`];
  if (f.status?.length) parts.push(inArray(hitRows.status, f.status));
  if (f.mechanism?.length) {
    const ors: SQL[] = [];
    const models = f.mechanism.filter((m) => m !== "ambiguous" && m !== "none");
    if (models.length) ors.push(inArray(hitRows.mechanism, models));
    if (f.mechanism.includes("ambiguous")) ors.push(sql`${hitRows.mechanismLabel} = 'ambiguous'`);
    if (f.mechanism.includes("none")) ors.push(sql`${hitRows.mechanism} is null`);
    parts.push(sql`(${sql.join(ors, sql` or `)})`);
  }
  if (f.flagged !== undefined) parts.push(eq(hitRows.flagged, f.flagged));
  if (f.hit !== undefined) parts.push(eq(hitRows.hit, f.hit));
  if (f.q)
    parts.push(
      sql`(${hitRows.compoundId} ilike ${`%${likeEscape(f.q)}%`} or ${hitRows.name} ilike ${`%${likeEscape(f.q)}%`})`,
    );
  if (f.owner) parts.push(sql`${hitRows.ownerName} ilike ${`%${likeEscape(f.owner)}%`}`);
  if (f.lastTestedFrom) parts.push(sql`${hitRows.lastTestedAt} >= ${f.lastTestedFrom.toISOString()}`);
  if (f.lastTestedTo)
    parts.push(sql`${hitRows.lastTestedAt} < ${new Date(f.lastTestedTo.getTime() + 86_400_000).toISOString()}`);
  for (const field of rangeFields) {
    const col = sortColumn[field];
    const min = f[`${field}Min`];
    const max = f[`${field}Max`];
    if (min !== undefined) parts.push(sql`${col} >= ${min}`);
    if (max !== undefined) parts.push(sql`${col} <= ${max}`);
  }
  return sql.join(parts, sql` and `);
}

/** The ranked order (clean rows first, then Ki, IC50, % inhibition) or one column, blanks last. */
function orderOf(f: HitFilter): SQL {
  if (f.sort === "default") {
    return sql`${hitRows.flagged} asc, ${hitRows.kiUm} asc nulls last, ${hitRows.ic50Um} asc nulls last, ${hitRows.pctInhibition} desc nulls last, ${hitRows.compoundId} asc`;
  }
  const col = sortColumn[f.sort];
  return f.dir === "desc"
    ? sql`${col} desc nulls last, ${hitRows.compoundId} desc`
    : sql`${col} asc nulls last, ${hitRows.compoundId} asc`;
}

/** Every column but the stored API item (which only the page query reads). */
const { itemJson: _itemJson, ...rowColumns } = getTableColumns(hitRows);
export type HitRow = Omit<typeof hitRows.$inferSelect, "itemJson">;

/** One row as the API, the grid and the export see it (concentrations µM). */
export function hitJson(r: HitRow): HitItem {
  return {
    registryId: r.compoundId,
    name: r.name,
    mechanism: r.mechanism,
    mechanismLabel: r.mechanismLabel,
    ki: r.kiUm,
    kiCi95: [r.kiLoUm, r.kiHiUm],
    kic: r.kicUm,
    kiu: r.kiuUm,
    alpha: r.alpha,
    ic50: r.ic50Um,
    ic50Qualifier: r.ic50Qualifier,
    ic50Ci95: [r.ic50LoUm, r.ic50HiUm],
    hill: r.hill,
    pctInhibition: r.pctInhibition,
    hit: r.hit,
    pKi: r.pKi,
    le: r.le,
    lipe: r.lipe,
    mw: r.mwGPerMol,
    clogp: r.clogp,
    heavyAtoms: r.heavyAtoms,
    flags: r.flags,
    flagged: r.flagged,
    status: r.status,
    owner: r.ownerName,
    statusChangedAt: r.statusChangedAt?.toISOString() ?? null,
    lastTested: r.lastTestedAt?.toISOString() ?? null,
    comments: r.commentCount,
  };
}
export type { HitItem };

export const HIT_UNITS = {
  ki: "µM",
  kic: "µM",
  kiu: "µM",
  ic50: "µM",
  pctInhibition: "%",
  le: "kcal/mol per heavy atom",
  mw: "g/mol",
  lipe: "dimensionless",
  alpha: "dimensionless",
};

// Totals of recent filters, per campaign version (hit_row_versions): counting up to 100,000
// rows on every page was most of a request's cost (bench/hits.ts). The version is read before
// the count, so a total is never kept under a version older than the rows it counted. The map
// holds the count's promise, so requests asking at the same moment (a grid opening for twenty
// people) share one count.
const totals = new Map<string, Promise<number>>();
const TOTALS_MAX = 5000;

function filterKey(campaignId: string, version: number, f: HitFilter): string {
  const { sort: _s, dir: _d, ...rest } = f as HitFilter & { limit?: number; offset?: number };
  delete (rest as { limit?: number }).limit;
  delete (rest as { offset?: number }).offset;
  const parts = Object.entries(rest)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => a.localeCompare(b))
    .map(
      ([k, v]) =>
        `${k}=${v instanceof Date ? v.toISOString() : Array.isArray(v) ? [...v].sort().join(",") : String(v)}`,
    );
  return `${campaignId}|${version}|${parts.join("&")}`;
}

/** A sorted, filtered page of the campaign's hit rows as JSON text (`[…]`), and how many rows match. */
export async function listHitsJson(
  campaignId: string,
  f: HitFilter,
  limit: number,
  offset: number,
): Promise<{ itemsJson: string; total: number }> {
  const where = whereOf(campaignId, f);
  // One statement (one round trip) for the page and the version its total is cached under. Each
  // row's item is stored JSON text (hit_rows.item_json, kept by a trigger): a page is 100 strings
  // joined. string_agg takes the rows in the order the sorted, limited subquery gives them (no
  // join or grouping in between to reorder them); a window or an ORDER BY inside the aggregate
  // to say so again doubled the statement's cost (measured with pgbench). The integration tests
  // compare the API's order with the export's.
  const [page] = await db.execute<{ items: string; version: number | null }>(sql`
    select (select ${hitRowVersions.version} from ${hitRowVersions} where ${hitRowVersions.campaignId} = ${campaignId}) as version,
           coalesce((select '[' || string_agg(p.item_json, ',') || ']'
                     from (select ${hitRows.itemJson} from ${hitRows} where ${where} order by ${orderOf(f)} limit ${limit} offset ${offset}) p), '[]') as items`);
  const key = filterKey(campaignId, Number(page?.version ?? 0), f);
  let total = totals.get(key);
  if (!total) {
    total = db
      .select({ n: sql<number>`count(*)::int` })
      .from(hitRows)
      .where(where)
      .then(([c]) => c?.n ?? 0);
    if (totals.size >= TOTALS_MAX) totals.delete(totals.keys().next().value!);
    totals.set(key, total);
    const counted = total;
    counted.catch(() => totals.get(key) === counted && totals.delete(key)); // a failed count is not kept
  }
  return { itemsJson: page?.items ?? "[]", total: await total };
}

/** The same page as objects. */
export async function listHits(
  campaignId: string,
  f: HitFilter,
  limit: number,
  offset: number,
): Promise<{ items: HitItem[]; total: number }> {
  const r = await listHitsJson(campaignId, f, limit, offset);
  return { items: JSON.parse(r.itemsJson) as HitItem[], total: r.total };
}

export const EXPORT_MAX_ROWS = 100_000;

/** Every row of the view (same filter and order as the grid), up to EXPORT_MAX_ROWS. */
export async function exportHits(campaignId: string, f: HitFilter): Promise<{ items: HitItem[]; truncated: boolean }> {
  const rows = await db
    .select(rowColumns)
    .from(hitRows)
    .where(whereOf(campaignId, f))
    .orderBy(orderOf(f))
    .limit(EXPORT_MAX_ROWS + 1);
  return { items: rows.slice(0, EXPORT_MAX_ROWS).map(hitJson), truncated: rows.length > EXPORT_MAX_ROWS };
}

// ---------------------------------------------------------------- triage

/**
 * Sets the triage status of one or more compounds, with an optional comment, in one
 * transaction: a history row and an audit row per compound that changes, then the hit rows.
 * Any unknown compound refuses the whole request (nothing written). Setting the status a
 * compound already has changes nothing and is not recorded.
 */
export async function setTriageStatus(
  actor: Actor,
  campaignId: string,
  registryIds: string[],
  status: TriageStatus,
  comment?: string,
) {
  const ids = [...new Set(registryIds)];
  return db.transaction(async (tx) => {
    const rows = await tx
      .select({ compoundId: hitRows.compoundId, status: hitRows.status })
      .from(hitRows)
      .where(and(eq(hitRows.campaignId, campaignId), inArray(hitRows.compoundId, ids)))
      .for("update");
    const known = new Map(rows.map((r) => [r.compoundId, r.status]));
    const missing = ids.filter((i) => !known.has(i));
    if (missing.length) {
      throw new AppError(
        ids.length === 1 ? "not_found" : "bad_request",
        `No result in this campaign for ${missing.slice(0, 5).join(", ")}${missing.length > 5 ? ` and ${missing.length - 5} more` : ""}. Nothing was changed.`,
        {
          details: missing
            .slice(0, 50)
            .map((m) => ({ field: "registryIds", message: `${m} has no current result in this campaign.` })),
        },
      );
    }
    const changing = ids.filter((i) => known.get(i) !== status);
    if (changing.length) {
      await tx
        .insert(triageDecisions)
        .values(
          changing.map((compoundId) => ({
            campaignId,
            compoundId,
            fromStatus: known.get(compoundId)!,
            toStatus: status,
            comment: comment || null,
            by: actor.id,
          })),
        );
      for (const compoundId of changing) {
        await audit(tx, actor, {
          campaignId,
          action: "triage.status",
          entityType: "compound",
          entityId: compoundId,
          before: { status: known.get(compoundId) },
          after: { status },
          reason: comment || null,
        });
      }
      await refreshHitRows(tx, campaignId, changing);
    }
    return { changed: changing.length, unchanged: ids.length - changing.length, status };
  });
}

/** A comment on a compound in the campaign (members who may comment). */
export async function addComment(actor: Actor, campaignId: string, registryId: string, body: string) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ id: hitRows.compoundId })
      .from(hitRows)
      .where(and(eq(hitRows.campaignId, campaignId), eq(hitRows.compoundId, registryId)));
    if (!row) throw new AppError("not_found", `No result in this campaign for ${registryId}.`);
    const [c] = await tx
      .insert(hitComments)
      .values({ campaignId, compoundId: registryId, body, by: actor.id })
      .returning({ id: hitComments.id, at: hitComments.at });
    await refreshHitRows(tx, campaignId, [registryId]);
    return { id: c!.id, at: c!.at.toISOString() };
  });
}

// ---------------------------------------------------------------- the compound panel

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
      kind: string;
      experiment_id: string;
      experiment_name: string;
      settings: Record<string, unknown>;
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
      substrateUm: (r.settings?.substrateUm as number | undefined) ?? null,
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

// ---------------------------------------------------------------- saved views

export async function listViews(userId: string, campaignId: string) {
  const rows = await db
    .select()
    .from(hitViews)
    .where(and(eq(hitViews.userId, userId), eq(hitViews.campaignId, campaignId)))
    .orderBy(asc(sql`lower(${hitViews.name})`));
  return rows.map((v) => ({
    id: v.id,
    name: v.name,
    state: v.state as SavedViewState,
    updatedAt: v.updatedAt.toISOString(),
  }));
}

/** Saves a named view for the user (a view of the same name is replaced). */
export async function saveView(userId: string, campaignId: string, name: string, state: SavedViewState) {
  // The unique index is on lower(name): drizzle's onConflict target takes columns only.
  const [v] = await db.execute<{ id: string }>(sql`
    insert into hit_views (user_id, campaign_id, name, state) values (${userId}, ${campaignId}, ${name}, ${JSON.stringify(state)}::jsonb)
    on conflict (user_id, campaign_id, lower(name)) do update set state = excluded.state, name = excluded.name, updated_at = now()
    returning id`);
  return { id: v!.id };
}

export async function deleteView(userId: string, campaignId: string, viewId: string) {
  if (!/^[0-9a-f-]{36}$/i.test(viewId)) throw new AppError("not_found", "No such view.");
  const gone = await db
    .delete(hitViews)
    .where(and(eq(hitViews.id, viewId), eq(hitViews.userId, userId), eq(hitViews.campaignId, campaignId)))
    .returning({ id: hitViews.id });
  if (gone.length === 0) throw new AppError("not_found", "No such view.");
}
