import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/server/db/client";

const WEEK = sql`now() - interval '7 days'`;

/**
 * The campaign overview's figures, each over the last 7 days (a rolling week): plate runs
 * uploaded, their QC pass rate and median Z′, compounds newly called hits, compounds with a
 * first Ki; the Z′ trend (last 200 runs), recent triage decisions and recent activity.
 */
export async function campaignOverview(campaignId: string) {
  const [[runs], [hits], trend, decisions, activity] = await Promise.all([
    db.execute<{ runs: number; passed: number; median_z: number | null; total_runs: number }>(sql`
      select count(*) filter (where uploaded_at >= ${WEEK})::int as runs,
             count(*) filter (where uploaded_at >= ${WEEK} and qc_verdict = 'pass')::int as passed,
             percentile_cont(0.5) within group (order by z_prime) filter (where uploaded_at >= ${WEEK}) as median_z,
             count(*)::int as total_runs
      from plate_runs where campaign_id = ${campaignId}`),
    db.execute<{ new_hits: number; new_ki: number; rows: number; flagged: number }>(sql`
      select count(*) filter (where hit and first_seen_at >= ${WEEK})::int as new_hits,
             count(*) filter (where ki_first_at >= ${WEEK})::int as new_ki,
             count(*)::int as rows,
             count(*) filter (where flagged)::int as flagged
      from hit_rows where campaign_id = ${campaignId}`),
    db.execute<{
      id: string;
      label: string;
      at: string;
      z_prime: number | null;
      verdict: "pass" | "fail";
      decision: string;
    }>(sql`
      select * from (
        select id, coalesce(barcode, file_name) as label, uploaded_at as at, z_prime, qc_verdict as verdict, decision
        from plate_runs where campaign_id = ${campaignId} order by uploaded_at desc, file_name desc limit 200) t
      order by at asc, label asc`),
    db.execute<{
      id: string;
      compound_id: string;
      from_status: string;
      to_status: string;
      comment: string | null;
      at: string;
      by: string | null;
    }>(sql`
      select d.id, d.compound_id, d.from_status, d.to_status, d.comment, d.at, u.name as by
      from triage_decisions d left join users u on u.id = d.by
      where d.campaign_id = ${campaignId} order by d.at desc, d.id desc limit 8`),
    db.execute<{
      kind: "run" | "analysis" | "comment";
      what: string;
      at: string;
      by: string | null;
      ref: string | null;
    }>(sql`
      select * from (
        (select 'run' as kind, coalesce(r.barcode, r.file_name) as what, r.uploaded_at as at, u.name as by, r.id::text as ref
           from plate_runs r left join users u on u.id = r.uploaded_by where r.campaign_id = ${campaignId} order by r.uploaded_at desc limit 10)
        union all
        (select 'analysis', e.name, a.finished_at, u.name, e.id::text
           from analyses a join experiments e on e.id = a.experiment_id left join users u on u.id = a.requested_by
           where a.campaign_id = ${campaignId} and a.status = 'done' order by a.finished_at desc limit 10)
        union all
        (select 'comment', c.compound_id, c.at, u.name, c.compound_id
           from hit_comments c left join users u on u.id = c.by where c.campaign_id = ${campaignId} order by c.at desc limit 10)
      ) x order by at desc limit 10`),
  ]);
  return {
    week: {
      runs: runs?.runs ?? 0,
      passRatePct: runs && runs.runs > 0 ? (100 * runs.passed) / runs.runs : null,
      medianZPrime: runs?.median_z ?? null,
      newHits: hits?.new_hits ?? 0,
      newKi: hits?.new_ki ?? 0,
    },
    totals: { runs: runs?.total_runs ?? 0, hitRows: hits?.rows ?? 0, flagged: hits?.flagged ?? 0 },
    trend: [...trend].map((t) => ({
      id: t.id,
      label: t.label,
      at: new Date(t.at).toISOString(),
      zPrime: t.z_prime,
      verdict: t.verdict,
      decision: t.decision,
    })),
    decisions: [...decisions].map((d) => ({
      id: d.id,
      compoundId: d.compound_id,
      from: d.from_status,
      to: d.to_status,
      comment: d.comment,
      at: new Date(d.at).toISOString(),
      by: d.by,
    })),
    activity: [...activity].map((a) => ({
      kind: a.kind,
      what: a.what,
      at: new Date(a.at).toISOString(),
      by: a.by,
      ref: a.ref,
    })),
  };
}
