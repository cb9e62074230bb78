import "server-only";
import crypto from "node:crypto";
import PgBoss from "pg-boss";
import { env } from "@/env";

/** Queue names of the background jobs (pg-boss, in Postgres; run by src/cli/worker.ts). */
export const QUEUES = { analysis: "analysis", digestTick: "digest-tick" } as const;

/** Every 10 minutes the worker sends the digests that are due (each campaign sets its own weekday, hour and zone). */
export const DIGEST_TICK_CRON = "*/10 * * * *";

/**
 * Liveness: a worker beats its own row and each analysis it runs every HEARTBEAT_MS; a running
 * analysis with no beat for ANALYSIS_STALE_SECONDS is taken to have lost its worker and is queued
 * again (at most MAX_ANALYSIS_ATTEMPTS takes in all); /api/health calls the worker down when no
 * worker has beaten for WORKER_STALE_SECONDS.
 */
export const LIVENESS = {
  heartbeatMs: 10_000,
  analysisStaleSeconds: 60,
  workerStaleSeconds: 30,
  sweepMs: 15_000,
  maxAnalysisAttempts: 3,
} as const;

let starting: Promise<PgBoss> | null = null;

/**
 * The web server's pg-boss handle: it only sends jobs (no maintenance, no schedules — the
 * worker process does those). Jobs live in Postgres, so they survive restarts and page reloads.
 */
export function boss(): Promise<PgBoss> {
  starting ??= (async () => {
    if (!env.DATABASE_URL) throw new Error("DATABASE_URL is not set.");
    const b = new PgBoss({
      connectionString: env.DATABASE_URL,
      schema: "pgboss",
      supervise: false,
      schedule: false,
      max: 2,
    });
    b.on("error", (e) => console.error("[jobs]", e));
    await b.start();
    // Idempotent in pg-boss 10: an error here is real, and a send without the queue would be lost.
    await b.createQueue(QUEUES.analysis);
    return b;
  })();
  return starting;
}

/**
 * The job id of an analysis's next take: the analysis id for the first, then derived from the
 * analysis id and how many takes it has had, so asking twice for the same queued analysis sends one job, while a re-queue after a dead
 * worker (whose job pg-boss still holds as active) or a retry after a failure gets a new one.
 */
export function analysisJobId(analysisId: string, attempts: number): string {
  if (attempts === 0) return analysisId; // the first take's job is the analysis id itself
  const h = crypto.createHash("sha256").update(`${analysisId}:${attempts}`).digest("hex");
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20, 32)}`;
}

/**
 * Queues an analysis's next take. The worker claims the row before it computes (status queued →
 * running in one conditional UPDATE), so a duplicate job finds nothing to do.
 */
export async function enqueueAnalysis(analysisId: string, attempts = 0): Promise<void> {
  const b = await boss();
  await b.send(
    QUEUES.analysis,
    { analysisId },
    { id: analysisJobId(analysisId, attempts), retryLimit: 2, retryDelay: 10, expireInMinutes: 30 },
  );
}

/** Stops this process's pg-boss handle (tests and scripts that sent jobs). */
export async function stopBoss(): Promise<void> {
  if (!starting) return;
  const b = await starting.catch(() => null);
  starting = null;
  await b?.stop({ graceful: false, wait: true }).catch(() => {});
}
