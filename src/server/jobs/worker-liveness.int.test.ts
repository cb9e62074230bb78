// A dead worker costs nothing: real worker processes (src/cli/worker.ts, started here as under
// `npm start`), one killed with SIGKILL in the middle of an analysis; the analysis is queued again
// exactly once and finished by a second worker within the bounded time, /api/health reports the
// dead worker meanwhile, a request for the stuck analysis does not hand it back as running, and a
// failed analysis can be retried. The bounds (10 s beats, 60 s stale, 15 s sweeps) are
// LIVENESS in boss.ts; the expectations are common practice for job queues (a lease renewed by
// heartbeats; a fencing token so a presumed-dead holder cannot commit), not an outside reference.
// The plate data are the invented test plate of src/test/plates.ts.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { spawn, type ChildProcess } from "node:child_process";
import { and, desc, eq, gt, sql } from "drizzle-orm";
import { db, sqlClient } from "@/server/db/client";
import { analyses, auditLog, compoundResults, workerHeartbeats } from "@/server/db/schema";
import { makeWorld, callRoute, type World } from "@/test/harness";
import { analysesWorld } from "@/test/analyses";
import { campaignRow } from "@/test/plates";
import { maskWell } from "@/server/services/plates";
import { requestAnalysis, requeueStaleAnalyses, retryAnalysis, runAnalysis } from "@/server/services/analyses";
import * as health from "@/app/api/health/route";
import * as retryRoute from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/[analysisId]/retry/route";
import { LIVENESS, stopBoss } from "./boss";

const started: ChildProcess[] = [];
function startWorker(tag: string): ChildProcess {
  const p = spawn(
    process.execPath,
    ["node_modules/tsx/dist/cli.mjs", "--tsconfig", "tsconfig.worker.json", "src/cli/worker.ts"],
    { cwd: process.cwd(), env: process.env, stdio: ["ignore", "pipe", "pipe"] },
  );
  p.stdout?.on("data", (d: Buffer) => process.stdout.write(`[${tag}] ${d}`));
  p.stderr?.on("data", (d: Buffer) => process.stderr.write(`[${tag}] ${d}`));
  started.push(p);
  return p;
}
async function until<T>(what: string, f: () => Promise<T | null | undefined | false>, timeoutMs: number): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await f();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out after ${timeoutMs / 1000} s waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 500));
  }
}
const row = (id: string) => db.query.analyses.findFirst({ where: eq(analyses.id, id) });
const healthNow = async () =>
  (await callRoute(health.GET, { user: null, path: "/api/health" })) as {
    status: number;
    json: { ok: boolean; services: { worker: boolean }; worker: { alive: number } | null };
  };

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});
afterAll(async () => {
  // SIGTERM: tsx passes it on to the worker it runs (a SIGKILL to tsx would leave that worker
  // running on, taking later tests' jobs), and the worker stops gracefully.
  const live = started.filter((p) => p.exitCode === null && p.signalCode === null);
  for (const p of live) p.kill("SIGTERM");
  await Promise.all(
    live.map(
      (p) =>
        new Promise((r) => {
          if (p.exitCode !== null || p.signalCode !== null) return r(null);
          const t = setTimeout(() => (p.kill("SIGKILL"), r(null)), 20_000);
          p.once("exit", () => (clearTimeout(t), r(null)));
        }),
    ),
  );
  await stopBoss();
});

describe("stale analyses (in process)", () => {
  it("a running analysis without a heartbeat for 60 s is queued again exactly once, and a request for it does not return it as running", async () => {
    const { experimentId, runId } = await analysesWorld(w);
    const campaign = await campaignRow(w.campaignId);
    await maskWell(w.people.assay, w.campaignId, runId, "B02", "stale-analysis check (invented)");
    const a = await requestAnalysis(w.people.assay, campaign, experimentId);
    // As a worker killed mid-run leaves it: running, taken once, last beat two minutes ago.
    await db
      .update(analyses)
      .set({ status: "running", attempts: 1, heartbeatAt: sql`now() - interval '2 minutes'` })
      .where(eq(analyses.id, a.id));
    const sweeps = await Promise.all(Array.from({ length: 6 }, () => requeueStaleAnalyses({ experimentId })));
    expect(sweeps.flat().filter((r) => r.id === a.id)).toEqual([{ id: a.id, attempts: 1, status: "queued" }]);
    const audits = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, a.id), eq(auditLog.action, "analysis.requeue")));
    expect(audits).toHaveLength(1);

    await db
      .update(analyses)
      .set({ status: "running", attempts: 2, heartbeatAt: sql`now() - interval '2 minutes'` })
      .where(eq(analyses.id, a.id));
    const again = await requestAnalysis(w.people.assay, campaign, experimentId);
    expect(again).toMatchObject({ id: a.id, status: "queued", reused: true });

    // The fence: a take whose row was claimed again meanwhile (attempts moved on) writes nothing.
    await db.update(analyses).set({ status: "queued" }).where(eq(analyses.id, a.id));
    await runAnalysis(a.id, async (f) => {
      if (f >= 0.8)
        await db
          .update(analyses)
          .set({ attempts: sql`${analyses.attempts} + 1` })
          .where(eq(analyses.id, a.id));
    });
    expect(await row(a.id)).toMatchObject({ status: "running", attempts: 4, isCurrent: false });
    expect(await db.$count(compoundResults, eq(compoundResults.analysisId, a.id))).toBe(0);
    await db.update(analyses).set({ status: "queued" }).where(eq(analyses.id, a.id));
    await runAnalysis(a.id);
    expect(await row(a.id)).toMatchObject({ status: "done", attempts: 5, isCurrent: true });
    expect(await db.$count(compoundResults, eq(compoundResults.analysisId, a.id))).toBeGreaterThan(0);
  });

  it("a failed analysis is retried through the route (role-checked, audited); a done one is refused with 409", async () => {
    const { experimentId, runId } = await analysesWorld(w);
    const campaign = await campaignRow(w.campaignId);
    await maskWell(w.people.assay, w.campaignId, runId, "B03", "retry check (invented)");
    const a = await requestAnalysis(w.people.assay, campaign, experimentId);
    await db
      .update(analyses)
      .set({ status: "failed", error: "the worker ran out of memory (invented)" })
      .where(eq(analyses.id, a.id));
    const path = `/api/campaigns/${w.campaignId}/experiments/${experimentId}/analyses/${a.id}/retry`;
    const params = { campaignId: w.campaignId, experimentId, analysisId: a.id };
    const viewer = await callRoute(retryRoute.POST, { user: w.people.viewer, method: "POST", path, params });
    expect(viewer.status).toBe(403);
    const r = await callRoute(retryRoute.POST, { user: w.people.lead, method: "POST", path, params });
    expect(r.status).toBe(202);
    expect(r.json).toEqual({ id: a.id, status: "queued" });
    expect(await row(a.id)).toMatchObject({ status: "queued", error: null });
    const audits = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, a.id), eq(auditLog.action, "analysis.retry")));
    expect(audits).toHaveLength(1);
    expect(audits[0]!.actorId).toBe(w.people.lead.id);
    await runAnalysis(a.id);
    await expect(retryAnalysis(w.people.lead, campaign, experimentId, a.id)).rejects.toThrow(/Only a failed analysis/);
  });
});

describe("a worker killed with SIGKILL mid-analysis", () => {
  it("is reported by /api/health, and its analysis is queued again once and done by a second worker", async () => {
    const { experimentId, runId } = await analysesWorld(w);
    const campaign = await campaignRow(w.campaignId);
    const [current] = await db
      .select({ id: analyses.id })
      .from(analyses)
      .where(and(eq(analyses.experimentId, experimentId), eq(analyses.isCurrent, true)));
    expect(current).toBeDefined();
    await maskWell(w.people.assay, w.campaignId, runId, "C02", "kill check (invented)");
    const a = await requestAnalysis(w.people.assay, campaign, experimentId);
    expect(a.status).toBe("queued");

    // Hold the current analysis's row: the new analysis's commit must un-mark it, so the first
    // worker claims the analysis, computes, beats, and then waits inside its commit.
    const testStart = new Date(Date.now() - 1000);
    const hold = await sqlClient.reserve();
    await hold`begin`;
    await hold`select id from analyses where id = ${current!.id} for update`;
    const first = startWorker("worker-1");
    try {
      const claimed = await until(
        "the first worker to take the analysis and wait in its commit",
        async () => {
          const r = await row(a.id);
          if (r?.status !== "running") return null;
          const waiting = await sqlClient`select 1 from pg_stat_activity where wait_event_type = 'Lock'`;
          return waiting.length > 0 ? r : null;
        },
        90_000,
      );
      expect(claimed.attempts).toBe(1);
      expect((await healthNow()).json.services.worker).toBe(true);
      // The worker process itself (tsx runs it as a child of its own launcher), as `kill -9 <pid>` would.
      const [me] = await db
        .select({ pid: workerHeartbeats.pid })
        .from(workerHeartbeats)
        .where(gt(workerHeartbeats.startedAt, testStart))
        .orderBy(desc(workerHeartbeats.startedAt))
        .limit(1);
      process.kill(me!.pid, "SIGKILL");
      await new Promise((r) => first.once("exit", r));
    } finally {
      await hold`rollback`;
      hold.release();
    }
    const killedAt = Date.now();

    // Health calls the worker down once its heartbeat is stale (30 s).
    const down = await until(
      "/api/health to report the dead worker",
      async () => {
        const h = await healthNow();
        return h.json.services.worker === false ? h : null;
      },
      (LIVENESS.workerStaleSeconds + 20) * 1000,
    );
    expect(down.status).toBe(503);
    expect(down.json.ok).toBe(false);
    expect((await row(a.id))?.status).toBe("running"); // not yet stale

    startWorker("worker-2");
    await until("/api/health to see the second worker", async () => (await healthNow()).json.services.worker, 60_000);
    const done = await until(
      "the analysis to be done by the second worker",
      async () => {
        const r = await row(a.id);
        return r?.status === "done" ? r : null;
      },
      (LIVENESS.analysisStaleSeconds + (2 * LIVENESS.sweepMs) / 1000 + 30) * 1000,
    );
    const seconds = (Date.now() - killedAt) / 1000;
    console.log(`[liveness] analysis re-queued and done ${seconds.toFixed(0)} s after the kill`);
    expect(seconds).toBeLessThan(120);
    expect(done).toMatchObject({ attempts: 2, isCurrent: true });
    const requeues = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, a.id), eq(auditLog.action, "analysis.requeue")));
    expect(requeues).toHaveLength(1);
    const results = await db.$count(compoundResults, eq(compoundResults.analysisId, a.id));
    expect(results).toBeGreaterThan(0);
    expect(results).toBe(done.compounds); // one set of results, not two
    const currents = await db.$count(
      analyses,
      and(eq(analyses.experimentId, experimentId), eq(analyses.isCurrent, true)),
    );
    expect(currents).toBe(1);
  }, 240_000);
});
