// Scale-out: two web handler sets, each with its own module instances and its own Postgres pool
// (as two web processes would have), and two real worker processes on one Postgres. 40
// analyses asked for twice each (once from each web set) at once, 40 compound imports committed
// twice each at once, and the weekly digest sent by two senders at once are each done exactly
// once: counted in result rows, registered compounds, audit rows, pg-boss job completions and
// the e-mail fake's outbox. "Exactly once under concurrency" is the product's rule (issue 15
// item 14); the mechanisms are advisory locks, conditional UPDATEs and unique keys. All data
// are invented (the small test plate of src/test/plates.ts, made-up structures and people).
import { describe, it, expect, beforeAll, afterAll, vi } from "vitest";
import { spawn, type ChildProcess } from "node:child_process";
import { and, eq, inArray, like, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { analyses, auditLog, compoundResults, compounds, digestSends, workerHeartbeats } from "@/server/db/schema";
import * as harnessA from "@/test/harness";
import { analysesWorld } from "@/test/analyses";
import { campaignRow } from "@/test/plates";
import { uniqueSmiles } from "@/test/compounds";
import { createExperiment } from "@/server/services/analyses";
import * as analysesRouteA from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/route";
import * as commitRouteA from "@/app/api/compound-imports/[importId]/commit/route";
import * as importsA from "@/server/services/compounds";
import * as digestA from "@/server/services/digest";
import { stopBoss } from "./boss";

type Harness = typeof harnessA;
type HandlerSet = {
  harness: Harness;
  analysesPost: typeof analysesRouteA.POST;
  commitPost: typeof commitRouteA.POST;
  imports: typeof importsA;
  digest: typeof digestA;
  close: () => Promise<void>;
};

const N = 40;
const workers: ChildProcess[] = [];
const ranBy = new Map<string, number>();
let w: harnessA.World;
let A: HandlerSet;
let B: HandlerSet;

function startWorker(tag: string): ChildProcess {
  const p = spawn(
    process.execPath,
    ["node_modules/tsx/dist/cli.mjs", "--tsconfig", "tsconfig.worker.json", "src/cli/worker.ts"],
    { cwd: process.cwd(), env: process.env, stdio: ["ignore", "pipe", "pipe"] },
  );
  p.stderr?.on("data", (d: Buffer) => process.stderr.write(`[${tag}] ${d}`));
  ranBy.set(tag, 0);
  p.stdout?.on("data", (d: Buffer) =>
    ranBy.set(tag, ranBy.get(tag)! + (String(d).match(/analysis \S+ done in/g)?.length ?? 0)),
  );
  workers.push(p);
  return p;
}
async function until<T>(what: string, f: () => Promise<T | null | undefined | false>, timeoutMs: number): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await f();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out after ${timeoutMs / 1000} s waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 300));
  }
}

beforeAll(async () => {
  const t0 = new Date(Date.now() - 1000);
  startWorker("worker-a");
  startWorker("worker-b");
  w = await harnessA.makeWorld();
  A = {
    harness: harnessA,
    analysesPost: analysesRouteA.POST,
    commitPost: commitRouteA.POST,
    imports: importsA,
    digest: digestA,
    close: async () => {},
  };
  // The second web "process": fresh module instances, and a pool of its own (db/client keeps one
  // per process on globalThis; dropping the reference makes the next import open another).
  const keep = globalThis.__inhibitrackDb;
  globalThis.__inhibitrackDb = undefined;
  vi.resetModules();
  const client = await import("@/server/db/client");
  B = {
    harness: await import("@/test/harness"),
    analysesPost: (await import("@/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/route")).POST,
    commitPost: (await import("@/app/api/compound-imports/[importId]/commit/route")).POST,
    imports: await import("@/server/services/compounds"),
    digest: await import("@/server/services/digest"),
    close: async () => {
      await (await import("./boss")).stopBoss();
      await client.sqlClient.end({ timeout: 5 });
    },
  };
  globalThis.__inhibitrackDb = keep;
  expect(client.sqlClient).not.toBe(keep?.client); // a pool of its own
  await until(
    "two workers to beat",
    async () =>
      (
        await db
          .select({ n: sql<number>`count(*)::int` })
          .from(workerHeartbeats)
          .where(sql`${workerHeartbeats.startedAt} > ${t0.toISOString()}::timestamptz`)
      )[0]!.n >= 2,
    60_000,
  );
}, 120_000);

afterAll(async () => {
  for (const p of workers) if (p.exitCode === null) p.kill("SIGTERM");
  await Promise.all(workers.map((p) => new Promise((r) => (p.exitCode !== null ? r(null) : p.once("exit", r)))));
  await B?.close();
  await stopBoss();
});

describe("two web handler sets and two workers on one Postgres", () => {
  it(`${N} analyses, each asked for from both web sets at once, are each run once`, async () => {
    const { runId } = await analysesWorld(w);
    const campaign = await campaignRow(w.campaignId);
    const experimentIds: string[] = [];
    for (let i = 0; i < N; i++)
      experimentIds.push(
        (
          await createExperiment(w.people.assay, campaign, {
            name: `Scale ${w.tag} ${i}`,
            kind: "single-dose",
            runIds: [runId],
          })
        ).id,
      );
    const ask = (set: HandlerSet, experimentId: string) =>
      set.harness.callRoute(set.analysesPost, {
        user: w.people.assay,
        method: "POST",
        path: `/api/campaigns/${w.campaignId}/experiments/${experimentId}/analyses`,
        params: { campaignId: w.campaignId, experimentId },
      });
    const answers = await Promise.all(experimentIds.flatMap((id) => [ask(A, id), ask(B, id)]));
    expect(answers.map((r) => r.status).filter((s) => s !== 202)).toEqual([]);
    const ids = [...new Set(answers.map((r) => (r.json as { id: string }).id))];
    expect(ids).toHaveLength(N); // one analysis per experiment, not two

    const done = await until(
      "every analysis to be done",
      async () => {
        const rows = await db.select().from(analyses).where(inArray(analyses.id, ids));
        return rows.every((r) => r.status === "done") ? rows : null;
      },
      90_000,
    );
    expect(done.map((r) => r.attempts)).toEqual(ids.map(() => 1)); // each taken once
    const results = await db
      .select({ id: compoundResults.analysisId, n: sql<number>`count(*)::int` })
      .from(compoundResults)
      .where(inArray(compoundResults.analysisId, ids))
      .groupBy(compoundResults.analysisId);
    const byId = new Map(results.map((r) => [r.id, r.n]));
    for (const a of done) expect(byId.get(a.id)).toBe(a.compounds);
    const currents = await db
      .select({ e: analyses.experimentId, n: sql<number>`count(*)::int` })
      .from(analyses)
      .where(and(inArray(analyses.experimentId, experimentIds), eq(analyses.isCurrent, true)))
      .groupBy(analyses.experimentId);
    expect(currents.map((c) => c.n)).toEqual(experimentIds.map(() => 1));
    const audits = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(auditLog)
      .where(and(eq(auditLog.action, "analysis.request"), inArray(auditLog.entityId, ids)));
    expect(audits[0]!.n).toBe(N);
    const jobs = await db.execute<{ n: number }>(
      sql`select count(*)::int as n from pgboss.job where name = 'analysis' and state = 'completed' and id = any(${sql.raw(`array[${ids.map((i) => `'${i}'`).join(",")}]::uuid[]`)})`,
    );
    expect(jobs[0]!.n).toBe(N); // one job per analysis, completed once
    // Which worker ran what is pg-boss's choice (one may take all when it polls first); logged, not asserted.
    console.log(`[scale-out] takes logged: worker-a ${ranBy.get("worker-a")}, worker-b ${ranBy.get("worker-b")}`);
  }, 150_000);

  it(`${N} compound imports, each committed from both web sets at once, register once`, async () => {
    const prefix = `Scale import ${w.tag}`;
    // Prepared a few at a time (the web process bounds how many uploads it parses at once); the
    // commits are what race.
    const starts: string[] = [];
    for (let k = 0; k < N; k += 4)
      starts.push(
        ...(await Promise.all(
          Array.from({ length: Math.min(4, N - k) }, async (_, d) => {
            const i = k + d;
            const set = i % 2 ? A : B;
            const text = `smiles,name\n${uniqueSmiles()},${prefix} ${i}a\n${uniqueSmiles()},${prefix} ${i}b\n`;
            const { job, done } = await set.imports.startImport(w.people.admin, {
              fileName: `scale-${w.tag}-${i}.csv`,
              contentType: "text/csv",
              bytes: new TextEncoder().encode(text),
            });
            await done;
            return job.id;
          }),
        )),
      );
    const commit = (set: HandlerSet, importId: string) =>
      set.harness.callRoute(set.commitPost, {
        user: w.people.admin,
        method: "POST",
        path: `/api/compound-imports/${importId}/commit`,
        params: { importId },
        body: { mode: "all_or_nothing" },
      });
    const answers = await Promise.all(starts.flatMap((id) => [commit(A, id), commit(B, id)]));
    const statuses = answers.map((r) => r.status);
    expect(statuses.filter((s) => s === 200 || s === 201)).toHaveLength(N); // one commit wins per import
    expect(statuses.filter((s) => s === 409)).toHaveLength(N); // the other is told it was already registered
    const registered = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(compounds)
      .where(like(compounds.name, `${prefix} %`));
    expect(registered[0]!.n).toBe(2 * N);
    const audits = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(auditLog)
      .where(and(eq(auditLog.action, "compound.import"), inArray(auditLog.entityId, starts)));
    expect(audits[0]!.n).toBe(N);
  }, 150_000);

  it("the weekly digest sent by two senders at once reaches each person once", async () => {
    const runs = await Promise.all([
      A.digest.sendCampaignDigest(w.campaignId, { trigger: "schedule" }),
      B.digest.sendCampaignDigest(w.campaignId, { trigger: "schedule" }),
      A.digest.sendCampaignDigest(w.campaignId, { trigger: "retry" }),
      B.digest.sendCampaignDigest(w.campaignId, { trigger: "retry" }),
    ]);
    const week = runs[0]!.week;
    const rows = await db
      .select()
      .from(digestSends)
      .where(and(eq(digestSends.campaignId, w.campaignId), eq(digestSends.week, week)));
    const members = Object.values(w.people).filter((p) => p.email !== w.people.nonMember.email);
    const recipients = new Set(rows.map((r) => r.userId));
    expect(rows).toHaveLength(recipients.size); // one row per person and week
    expect(rows.every((r) => r.status === "sent")).toBe(true);
    // The two workers run the digest schedule too, so some (or all) of the sends may be theirs;
    // the outbox below counts every send of this week's rows, whoever made it.
    expect(runs.reduce((s, r) => s + r.sent, 0)).toBeLessThanOrEqual(rows.length);
    const mail = (await harnessA.outbox()).filter((m) => rows.some((r) => r.idempotencyKey === m.idempotency_key));
    expect(mail).toHaveLength(rows.length);
    expect(recipients.size).toBeGreaterThan(0);
    expect(recipients.size).toBeLessThanOrEqual(members.length);
  }, 60_000);
});
