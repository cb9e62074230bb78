// The background worker: runs queued analyses and the weekly digest schedule (pg-boss jobs in
// Postgres) so a campaign-sized analysis never blocks a request, and survives page reloads and
// restarts. Started by `npm start`; several workers may run at once (a job is taken by one of
// them). It reads the parsed environment (src/env.ts) and exits non-zero when set-up fails.
// Liveness: it beats its own row (worker_heartbeats, read by /api/health) and each running
// analysis; every worker sweeps running analyses whose worker stopped beating back to the queue.
import PgBoss from "pg-boss";
import { requeueStaleAnalyses, runAnalysis } from "@/server/services/analyses";
import { QUEUES, DIGEST_TICK_CRON, LIVENESS } from "@/server/jobs/boss";
import { startWorkerHeartbeat } from "@/server/jobs/heartbeat";
import { sendDueDigests } from "@/server/services/digest";
import { sqlClient } from "@/server/db/client";
import { env } from "@/env";

if (!env.DATABASE_URL) {
  console.error("[worker] DATABASE_URL is not set.");
  process.exit(2);
}

/** Set-up that must succeed: without its queues the worker would run and silently do nothing. */
async function required<T>(what: string, p: Promise<T>): Promise<T> {
  try {
    return await p;
  } catch (e) {
    console.error(`[worker] cannot ${what}: ${e instanceof Error ? e.message : String(e)}`);
    process.exit(1);
  }
}

const heartbeat = await required("register the worker's heartbeat", startWorkerHeartbeat());
const boss = new PgBoss({ connectionString: env.DATABASE_URL, schema: "pgboss", max: 4 });
boss.on("error", (e) => console.error("[worker]", e.message));
await required("start the job queue (pg-boss)", boss.start());
// createQueue is idempotent in pg-boss 10 (insert … on conflict do nothing), so an error here is real.
await required(`create the queue "${QUEUES.analysis}"`, boss.createQueue(QUEUES.analysis));
await boss.work<{ analysisId: string }>(QUEUES.analysis, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => {
  if (!job) return;
  const t0 = Date.now();
  await runAnalysis(job.data.analysisId);
  console.log(`[worker] analysis ${job.data.analysisId} done in ${Date.now() - t0} ms`);
});
// The weekly digest: a schedule kept in Postgres by pg-boss (it survives restarts); each tick
// sends what is due and retries failed sends whose backoff has passed. Sending is idempotent.
await required(`create the queue "${QUEUES.digestTick}"`, boss.createQueue(QUEUES.digestTick));
await required(
  "schedule the weekly digest",
  boss.schedule(QUEUES.digestTick, DIGEST_TICK_CRON, {}, { tz: "UTC", retryLimit: 3, retryBackoff: true }),
);
await boss.work(QUEUES.digestTick, { batchSize: 1, pollingIntervalSeconds: 5 }, async () => {
  const r = await sendDueDigests();
  if (r.sent > 0) console.log(`[worker] weekly digest: ${r.sent} sent for ${r.campaigns} campaign(s)`);
});
// Analyses left running by a worker that died go back to the queue (each once, whichever worker sweeps first).
const sweep = async () => {
  try {
    for (const r of await requeueStaleAnalyses())
      console.log(`[worker] analysis ${r.id} had no heartbeat: ${r.status === "queued" ? "queued again" : "failed"}`);
  } catch (e) {
    console.error("[worker] sweep of stale analyses failed:", e instanceof Error ? e.message : e);
  }
};
await sweep();
const sweeper = setInterval(sweep, LIVENESS.sweepMs);
console.log(`[worker] ready (pid ${process.pid}): analyses, weekly digest schedule`);

let stopping = false;
async function stop() {
  if (stopping) return;
  stopping = true;
  clearInterval(sweeper);
  await boss.stop({ graceful: true, timeout: 10_000 }).catch(() => {});
  await heartbeat.stop();
  await sqlClient.end({ timeout: 5 }).catch(() => {});
  process.exit(0);
}
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
