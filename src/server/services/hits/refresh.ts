import "server-only";
import { sql } from "drizzle-orm";
import type { Db, Tx } from "@/server/db/client";
import { HEADLINE_CONSTANT } from "@/lib/analysis/headline-ki";
import { efficiencySql } from "@/lib/hits/efficiency";
import { INHIBITION_MODELS } from "@/lib/kinetics";

/**
 * The key of a model's headline constant in a result's detail, as a Postgres `case` over the
 * model expression, generated from HEADLINE_CONSTANT (src/lib/analysis/headline-ki.ts):
 * `"Um"` gives the value's key (`kicUm`, `kiuUm`), `""` the key of its interval in `ci95`.
 * `modelExpr` is a column of this module's own SQL, never user input.
 */
export function headlineKeySql(modelExpr: string, suffix: "Um" | ""): string {
  const arms = INHIBITION_MODELS.map((m) => `when '${m}' then '${HEADLINE_CONSTANT[m]}${suffix}'`);
  return `(case ${modelExpr} ${arms.join(" ")} end)`;
}

const overrideKiKey = sql.raw(headlineKeySql("override_model", "Um"));
const overrideCiKey = sql.raw(headlineKeySql("override_model", ""));
const efficiency = efficiencySql({ kiUm: "mech.ki_um", pKi: "b.p_ki", heavyAtoms: "b.heavy_atoms", clogp: "b.clogp" });
const pKiSql = sql.raw(efficiency.pKi);
const leSql = sql.raw(efficiency.le);
const lipeSql = sql.raw(efficiency.lipe);

/**
 * Recomputes the hit rows of the given compounds in a campaign from the current analyses
 * (`analyses.is_current`), inside the caller's transaction, so the grid never disagrees with
 * the results, overrides, decisions and comments committed with it. One statement:
 *
 * - single-dose: the latest current result's % inhibition and hit call;
 * - dose-response: the latest current IC50 (95 % CI, qualifier) and Hill slope;
 * - mechanism: the latest current call, or the latest override (Ki then comes from the
 *   overriding model's fit: its headline constant, `headlineKeySql` above);
 * - flags: the union over every current result; `flagged` = any flag or an ambiguous call;
 * - pKi, LE and LipE: the expressions of src/lib/hits/efficiency.ts (`efficiencySql`), so
 *   Postgres can sort and filter on them;
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
                    else (detail->'models'->override_model->>${overrideKiKey})::float8 end as ki_um,
               case when override_model is null then ki_lo_um
                    else (detail->'models'->override_model->'ci95'->${overrideCiKey}->>0)::float8 end as ki_lo_um,
               case when override_model is null then ki_hi_um
                    else (detail->'models'->override_model->'ci95'->${overrideCiKey}->>1)::float8 end as ki_hi_um,
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
               ${pKiSql} as p_ki,
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
             b.p_ki, ${leSql}, ${lipeSql},
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
