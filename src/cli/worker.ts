// The background worker: runs queued analyses (pg-boss jobs in Postgres) so a campaign-sized
// analysis never blocks a request, and survives page reloads and restarts. Started by
// `npm start`; several workers may run at once (a job is taken by one of them).
import PgBoss from "pg-boss";
import { runAnalysis } from "@/server/services/analyses";
import { QUEUES } from "@/server/jobs/boss";
import { sqlClient } from "@/server/db/client";

const url = process.env.DATABASE_URL;
if (!url) {
  console.error("[worker] DATABASE_URL is not set.");
  process.exit(2);
}

const boss = new PgBoss({ connectionString: url, schema: "pgboss", max: 4 });
boss.on("error", (e) => console.error("[worker]", e.message));
await boss.start();
await boss.createQueue(QUEUES.analysis).catch(() => {});
await boss.work<{ analysisId: string }>(QUEUES.analysis, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => {
  if (!job) return;
  const t0 = Date.now();
  await runAnalysis(job.data.analysisId);
  console.log(`[worker] analysis ${job.data.analysisId} done in ${Date.now() - t0} ms`);
});
console.log("[worker] ready: analyses");

let stopping = false;
async function stop() {
  if (stopping) return;
  stopping = true;
  await boss.stop({ graceful: true, timeout: 10_000 }).catch(() => {});
  await sqlClient.end({ timeout: 5 }).catch(() => {});
  process.exit(0);
}
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
