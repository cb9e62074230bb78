/**
 * Benchmark (not a test): the hit grid over a campaign of 100,000 compounds with results.
 *
 * 1. Population (all INVENTED, marked "bench (invented)"): 300 demo structures registered through
 *    the service, copied in SQL to 100,000 compounds "HB-000001"…; a campaign with a single-dose
 *    screen (all), a dose-response analysis (30 %) and a mechanism study (3 %) written with
 *    multi-row INSERT … SELECT; then `refreshHitRows` for all 100,000 in one transaction (timed:
 *    it is what runAnalysis does after a 100,000-compound screen); some triage decisions.
 * 2. `next build` into .next-test-bench-hits and `next start` on 127.0.0.1 with the bench database.
 * 3. autocannon: 20 concurrent connections ask for sorted, filtered pages of 100 (five query
 *    shapes, random offsets 0–1,900) from `GET /api/campaigns/{id}/hits` for 20 s: p50/p95/p99.
 * 4. The grid page in Debian's chromium (playwright-core): time from navigation until the first
 *    rows are in the grid (the page answers clicks), median of 5 loads.
 * Goals: p95 < 150 ms; interactive < 2 s.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import crypto from "node:crypto";
import autocannon from "autocannon";
import { sql } from "drizzle-orm";
import { db, sqlClient } from "@/server/db/client";
import { campaigns, memberships, users } from "@/server/db/schema";
import { demoCompounds } from "@/lib/chem/demo-compounds";
import { insertCompounds, prepareStructure, type PreparedCompound } from "@/server/services/compounds";
import { bumpHitVersion, refreshHitRows } from "@/server/services/hits";
import { createSessionId, SESSION_COOKIE } from "@/server/auth/session";
import { launch } from "../e2e/lib/browser";

const N = 100_000;
const CLIENTS = 20;
const DURATION_MS = 20_000;
const WARMUP_MS = 3_000;
const PORT = 3990;
const BASE = `http://127.0.0.1:${PORT}`;
const root = path.resolve(import.meta.dirname, "..");

const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil(q * s.length) - 1))] ?? NaN;
};

async function populate() {
  const t0 = performance.now();
  // Bench database only: the 100,000 compounds repeat 300 structures, so the unique structure
  // index is replaced by a plain one (as bench/compounds-search.ts does; the app never does).
  await db.execute(sql`drop index if exists compounds_structure_key`);
  await db.execute(sql`create index if not exists compounds_structure_key_bench on compounds (structure_key)`);
  const pool: PreparedCompound[] = [];
  const seen = new Set<string>();
  for (const d of demoCompounds()) {
    const p = prepareStructure({ smiles: d.smiles });
    if (seen.has(p.properties.structureKey)) continue;
    seen.add(p.properties.structureKey);
    pool.push({
      properties: p.properties,
      fingerprintBits: p.fingerprintBits,
      name: `HBSRC ${d.name} (bench, invented)`,
      aliases: [],
      batches: [],
      stocks: [],
    });
  }
  await db.transaction((tx) => insertCompounds(tx, null, pool).then(() => undefined));
  await db.execute(sql`
    insert into compounds (registry_id, registry_number, name, aliases, structure_key, flat_key, canonical_smiles, formula, mw_g_per_mol, exact_mass_da,
                           heavy_atoms, clogp, hbd, hba, tpsa_a2, rotatable_bonds, fingerprint)
    select 'HB-' || lpad(g::text, 6, '0'), nextval('compound_number_seq'), 'bench compound ' || g || ' (invented)', '{}', s.structure_key, s.flat_key,
           s.canonical_smiles, s.formula, s.mw_g_per_mol, s.exact_mass_da, s.heavy_atoms, s.clogp, s.hbd, s.hba, s.tpsa_a2, s.rotatable_bonds, s.fingerprint
    from generate_series(1, ${N}::int) g
    join (select row_number() over (order by registry_number) - 1 as k, c.* from compounds c where c.name like 'HBSRC %') s on s.k = g % ${pool.length}`);
  const tCompounds = performance.now();

  const lead = {
    id: crypto.randomUUID(),
    email: `bench-lead-${Date.now()}@bench.invalid`,
    name: "Bench Lead (invented)",
  };
  await db.insert(users).values({ ...lead, passwordHash: null, globalRole: "member" });
  const [c] = await db
    .insert(campaigns)
    .values({ name: "Bench campaign, 100,000 compounds (invented)", targetEnzyme: "Benchase (invented)" })
    .returning();
  const campaignId = c!.id;
  await db.insert(memberships).values({ campaignId, userId: lead.id, role: "lead" });

  await db.execute(sql`select setseed(0.42)`);
  const addAnalysis = async (kind: string, share: number, cols: ReturnType<typeof sql>) => {
    const [e] = await db.execute<{ id: string }>(
      sql`insert into experiments (campaign_id, name, kind) values (${campaignId}, ${`Bench ${kind} (invented)`}, ${kind}) returning id`,
    );
    const inputs = JSON.stringify({
      engineVersion: "bench",
      kind,
      settings: { resolved: { hitThresholdPct: 50, kmUm: null, enzymeNm: null } },
      runs: [],
      masks: [],
    });
    const [a] = await db.execute<{ id: string }>(sql`
      insert into analyses (experiment_id, campaign_id, status, progress, engine_version, input_hash, inputs, is_current, finished_at)
      values (${e!.id}, ${campaignId}, 'done', 1, 'bench', ${crypto.randomUUID()}, ${inputs}::jsonb, true, now()) returning id`);
    await db.execute(sql`
      insert into compound_results (analysis_id, experiment_id, campaign_id, kind, compound_id, n_points, pct_inhibition, hit, ic50_um, ic50_lo_um, ic50_hi_um,
                                    hill, mechanism, mechanism_label, ki_um, ki_lo_um, ki_hi_um, kic_um, kiu_um, alpha, flags, detail)
      select ${a!.id}, ${e!.id}, ${campaignId}, ${kind}, 'HB-' || lpad(g::text, 6, '0'), 4, ${cols}
      from generate_series(1, ${N}::int) g
      cross join lateral (select 120 * random() - 10 + 0 * g as p, power(10, 3 * random() - 2.5 + 0 * g) as ic, power(10, 3 * random() - 3 + 0 * g) as ki,
                                 random() + 0 * g as r1, random() + 0 * g as r2, random() + 0 * g as r3) x
      where g <= ${Math.round(N * share)}`);
  };
  await addAnalysis(
    "single-dose",
    1,
    sql`x.p, x.p >= 50, null, null, null, null, null, null, null, null, null, null, null, null,
        case when x.r1 < 0.05 then '{replicates-disagree}'::text[] else '{}' end, '{}'::jsonb`,
  );
  await addAnalysis(
    "dose-response",
    0.3,
    sql`null, null, x.ic, x.ic / 1.8, x.ic * 1.8, 0.6 + x.r2 * 1.2, null, null, null, null, null, null, null, null,
        case when x.r1 < 0.1 then '{hill-outside-0.5-2}'::text[] else '{}' end, '{}'::jsonb`,
  );
  await addAnalysis(
    "mechanism",
    0.03,
    sql`null, null, null, null, null, null, (array['competitive','uncompetitive','noncompetitive','mixed'])[1 + floor(x.r2 * 4)::int],
        case when x.r1 < 0.15 then 'ambiguous' else 'clear' end, x.ki, x.ki / 1.5, x.ki * 1.5, x.ki, x.ki * 3, 3, '{}'::text[], '{}'::jsonb`,
  );
  const tResults = performance.now();
  const ids = Array.from({ length: N }, (_, k) => `HB-${String(k + 1).padStart(6, "0")}`);
  await db.transaction((tx) => refreshHitRows(tx, campaignId, ids));
  const tRefresh = performance.now();
  // Invented decisions and test dates so status, owner and last-tested filters have something to work on.
  await db.execute(sql`
    with pick as (select compound_id, (array['confirmed','advance','on-hold','dropped'])[1 + floor(random() * 4)::int]::triage_status as s
                  from hit_rows where campaign_id = ${campaignId} and random() < 0.2)
    insert into triage_decisions (campaign_id, compound_id, from_status, to_status, comment, by)
    select ${campaignId}, compound_id, 'unreviewed', s, 'bench decision (invented)', ${lead.id} from pick`);
  await db.execute(sql`
    update hit_rows h set status = d.to_status, owner_id = d.by, owner_name = ${lead.name}, status_changed_at = d.at
    from triage_decisions d where d.campaign_id = h.campaign_id and d.compound_id = h.compound_id and h.campaign_id = ${campaignId}`);
  await db.execute(
    sql`update hit_rows set last_tested_at = now() - random() * interval '90 days' where campaign_id = ${campaignId}`,
  );
  await bumpHitVersion(db, campaignId); // the rows were changed directly above

  await db.execute(sql`vacuum analyze hit_rows`);
  return {
    campaignId,
    leadId: lead.id,
    compoundsS: (tCompounds - t0) / 1000,
    resultsS: (tResults - tCompounds) / 1000,
    refreshS: (tRefresh - tResults) / 1000,
  };
}

/** For repeated runs while tuning (BENCH_HITS_REUSE=1 with a kept DATABASE_URL): the campaign a previous run filled. */
async function reusable() {
  const [r] = await db.execute<{ campaign_id: string; user_id: string }>(sql`
    select m.campaign_id, m.user_id from campaigns c join memberships m on m.campaign_id = c.id
    where c.name = 'Bench campaign, 100,000 compounds (invented)' and m.role = 'lead'
      and (select count(*) from hit_rows h where h.campaign_id = c.id) = ${N} limit 1`);
  return r ? { campaignId: r.campaign_id, leadId: r.user_id, compoundsS: 0, resultsS: 0, refreshS: 0 } : null;
}

const QUERIES = [
  { name: "Ki ascending, unreviewed", qs: "sort=ki&dir=asc&status=unreviewed" },
  { name: "IC50 descending, competitive or mixed", qs: "sort=ic50&dir=desc&mechanism=competitive,mixed" },
  { name: "LE descending, clean, MW ≤ 450", qs: "sort=le&dir=desc&flagged=false&mwMax=450" },
  { name: "ranked order, unreviewed or confirmed", qs: "status=unreviewed,confirmed" },
  { name: "% inhibition descending, hits with cLogP ≤ 4", qs: "sort=pctInhibition&dir=desc&hit=true&clogpMax=4" },
];

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv) {
  const r = spawnSync(cmd, args, { cwd: root, env, stdio: "inherit" });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(" ")} failed`);
}

async function waitFor(url: string, ms: number) {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    try {
      if ((await fetch(url)).ok) return;
    } catch {}
    await new Promise((r) => setTimeout(r, 500));
  }
  throw new Error(`${url} did not answer within ${ms / 1000} s`);
}

type LoadResult = { lat: number[]; per: Map<string, number[]>; errors: number; seconds: number };

/**
 * autocannon with CLIENTS connections for `seconds` (after a warm-up whose responses are not
 * counted). Each connection keeps one query shape of `paths` and asks for a random page of it;
 * every response time is kept, so the percentiles are exact rather than histogram buckets.
 */
async function cannon(
  paths: { name: string; path: (offset: number) => string }[],
  cookie: string,
  seconds: number,
): Promise<LoadResult> {
  const run = (duration: number, record: boolean) =>
    new Promise<LoadResult>((resolve, reject) => {
      const lat: number[] = [];
      const per = new Map<string, number[]>(paths.map((q) => [q.name, []]));
      let errors = 0;
      let next = 0;
      const instance = autocannon(
        {
          url: BASE,
          connections: CLIENTS,
          duration,
          headers: { cookie },
          requests: [
            {
              method: "GET",
              setupRequest: (req, context: { q?: number }) => {
                context.q ??= next++ % paths.length;
                return { ...req, path: paths[context.q]!.path(100 * Math.floor(Math.random() * 20)) };
              },
            },
          ],
        },
        (err) => (err ? reject(err) : resolve({ lat, per, errors, seconds: duration })),
      );
      instance.on("response", (client, status, _bytes, ms) => {
        if (status !== 200) errors += 1;
        else if (record) {
          lat.push(ms);
          const q = (client as unknown as { requestIterator: { context: { q: number } } }).requestIterator.context.q;
          per.get(paths[q]!.name)!.push(ms);
        }
      });
      instance.on("reqError", () => (errors += 1));
    });
  await run(WARMUP_MS / 1000, false);
  return run(seconds, true);
}

/** The same clients on GET /api/me (a session check and one query): the stack's floor here. */
const floor = (cookie: string) => cannon([{ name: "me", path: () => "/api/me" }], cookie, 10);

const load = (campaignId: string, cookie: string) =>
  cannon(
    QUERIES.map((q) => ({
      name: q.name,
      path: (offset: number) => `/api/campaigns/${campaignId}/hits?${q.qs}&limit=100&offset=${offset}`,
    })),
    cookie,
    DURATION_MS / 1000,
  );

async function timeToInteractive(campaignId: string, sessionId: string) {
  const browser = await launch();
  const times: number[] = [];
  try {
    for (let i = 0; i < 6; i++) {
      const ctx = await browser.newContext({ viewport: { width: 1360, height: 860 } });
      await ctx.addCookies([{ name: SESSION_COOKIE, value: sessionId, domain: "127.0.0.1", path: "/" }]);
      const page = await ctx.newPage();
      const t0 = performance.now();
      await page.goto(`${BASE}/campaigns/${campaignId}/hits`);
      await page.locator('.ag-row[row-index="0"] [data-testid="open-panel"]').waitFor({ timeout: 30_000 });
      const ms = performance.now() - t0;
      if (i > 0) times.push(ms); // the first load warms the server's caches
      await ctx.close();
    }
  } finally {
    await browser.close();
  }
  return times;
}

async function main() {
  console.log(
    `Hit grid over ${N.toLocaleString("en")} invented compounds (${os.availableParallelism()} cores, load average before start ${os.loadavg()[0]?.toFixed(1)})\n`,
  );
  const pop = (process.env.BENCH_HITS_REUSE === "1" && (await reusable())) || (await populate());
  const [rows] = await db.execute<{ n: number }>(
    sql`select count(*)::int as n from hit_rows where campaign_id = ${pop.campaignId}`,
  );
  console.log(
    `population: compounds ${pop.compoundsS.toFixed(1)} s, results ${pop.resultsS.toFixed(1)} s, refreshHitRows for ${rows!.n.toLocaleString("en")} compounds in one transaction ${pop.refreshS.toFixed(1)} s\n`,
  );
  const sessionId = await createSessionId(pop.leadId);
  const cookie = `${SESSION_COOKIE}=${sessionId}`;
  // A dist folder that eslint and git already ignore (".next-test*"), apart from the test builds.
  const env = {
    ...process.env,
    NEXT_DIST_DIR: ".next-test-bench-hits",
    NEXT_TELEMETRY_DISABLED: "1",
    NODE_ENV: "production" as const,
    APP_URL: BASE,
  };
  const tb = performance.now();
  // next build adds its dist folder to tsconfig.json's include list; put the shared file back.
  const tsconfig = fs.readFileSync(path.join(root, "tsconfig.json"), "utf8");
  try {
    if (!(process.env.BENCH_HITS_NO_BUILD === "1" && fs.existsSync(path.join(root, env.NEXT_DIST_DIR, "BUILD_ID"))))
      run(process.execPath, ["node_modules/next/dist/bin/next", "build"], env);
  } finally {
    if (fs.readFileSync(path.join(root, "tsconfig.json"), "utf8") !== tsconfig)
      fs.writeFileSync(path.join(root, "tsconfig.json"), tsconfig);
  }
  console.log(`\nnext build: ${((performance.now() - tb) / 1000).toFixed(0)} s`);
  let server: ChildProcess | null = spawn(
    process.execPath,
    ["node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", String(PORT)],
    { cwd: root, env, stdio: ["ignore", "ignore", "inherit"] },
  );
  try {
    await waitFor(`${BASE}/api/health`, 90_000);
    const r = await load(pop.campaignId, cookie);
    const tti = await timeToInteractive(pop.campaignId, sessionId);
    const me = (await floor(cookie)).lat;
    const p95 = quantile(r.lat, 0.95);
    const ttiMed = quantile(tti, 0.5);
    console.log(
      `\n${CLIENTS} concurrent clients for ${r.seconds} s after a ${WARMUP_MS / 1000} s warm-up, pages of 100 from GET /api/campaigns/{id}/hits over HTTP on loopback (next start)\n`,
    );
    console.log("| query | requests | p50 (ms) | p95 (ms) | p99 (ms) |");
    console.log("|---|---:|---:|---:|---:|");
    for (const q of QUERIES) {
      const xs = r.per.get(q.name)!;
      console.log(
        `| ${q.name} | ${xs.length} | ${quantile(xs, 0.5).toFixed(0)} | ${quantile(xs, 0.95).toFixed(0)} | ${quantile(xs, 0.99).toFixed(0)} |`,
      );
    }
    console.log(
      `| **all** | ${r.lat.length} (${(r.lat.length / r.seconds).toFixed(0)}/s, ${r.errors} errors) | ${quantile(r.lat, 0.5).toFixed(0)} | **${p95.toFixed(0)}** | ${quantile(r.lat, 0.99).toFixed(0)} |`,
    );
    console.log(
      `| for comparison: GET /api/me (session check + 1 query), 10 s | ${me.length} (${(me.length / 10).toFixed(0)}/s) | ${quantile(me, 0.5).toFixed(0)} | ${quantile(me, 0.95).toFixed(0)} | ${quantile(me, 0.99).toFixed(0)} |`,
    );
    console.log(
      `\n| grid page in chromium | loads | median (ms) | max (ms) |\n|---|---:|---:|---:|\n| navigation → first rows in the grid | ${tti.length} | **${ttiMed.toFixed(0)}** | ${Math.max(...tti).toFixed(0)} |`,
    );
    console.log(
      `\nload average at the end: ${os.loadavg()[0]?.toFixed(1)} (other processes on this machine share its ${os.availableParallelism()} cores)`,
    );
    console.log(
      `\ngoals: p95 < 150 ms: ${p95 < 150 ? "met" : "NOT met"}; interactive < 2 s: ${ttiMed < 2000 ? "met" : "NOT met"}`,
    );
    if (r.errors > 0) process.exitCode = 1;
  } finally {
    server.kill("SIGTERM");
    server = null;
  }
}

main()
  .catch((e) => {
    console.error(e);
    process.exitCode = 1;
  })
  .finally(() => sqlClient.end());
