import "server-only";
import PgBoss from "pg-boss";
import { env } from "@/env";

/** Queue names of the background jobs (pg-boss, in Postgres; run by src/cli/worker.ts). */
export const QUEUES = { analysis: "analysis", digestTick: "digest-tick" } as const;

/** Every 10 minutes the worker sends the digests that are due (each campaign sets its own weekday, hour and zone). */
export const DIGEST_TICK_CRON = "*/10 * * * *";

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

/** Queues an analysis; the analysis id is the job id, so asking twice queues it once. */
export async function enqueueAnalysis(analysisId: string): Promise<void> {
  const b = await boss();
  await b.send(QUEUES.analysis, { analysisId }, { id: analysisId, retryLimit: 2, retryDelay: 10, expireInMinutes: 30 });
}

/** Stops this process's pg-boss handle (tests and scripts that sent jobs). */
export async function stopBoss(): Promise<void> {
  if (!starting) return;
  const b = await starting.catch(() => null);
  starting = null;
  await b?.stop({ graceful: false, wait: true }).catch(() => {});
}
