import "server-only";
import crypto from "node:crypto";
import os from "node:os";
import { eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { workerHeartbeats } from "@/server/db/schema";
import { LIVENESS } from "./boss";

/**
 * The worker process's own heartbeat: a row in worker_heartbeats, written at start and every
 * LIVENESS.heartbeatMs, deleted on a graceful stop. /api/health reads it (workerLiveness).
 * Returns a stop function.
 */
export async function startWorkerHeartbeat(): Promise<{ id: string; stop: () => Promise<void> }> {
  const id = crypto.randomUUID();
  await db.insert(workerHeartbeats).values({ id, host: os.hostname(), pid: process.pid });
  // Rows of workers killed long ago say nothing any more.
  await db.delete(workerHeartbeats).where(sql`${workerHeartbeats.beatAt} < now() - interval '1 day'`);
  const timer = setInterval(() => {
    db.update(workerHeartbeats)
      .set({ beatAt: sql`now()` })
      .where(eq(workerHeartbeats.id, id))
      .catch((e) => console.error("[worker] heartbeat failed:", e instanceof Error ? e.message : e));
  }, LIVENESS.heartbeatMs);
  timer.unref?.();
  return {
    id,
    stop: async () => {
      clearInterval(timer);
      await db
        .delete(workerHeartbeats)
        .where(eq(workerHeartbeats.id, id))
        .catch(() => {});
    },
  };
}

export type WorkerLiveness = { alive: number; lastHeartbeatAt: string | null; staleAfterSeconds: number };

/** How many workers beat within LIVENESS.workerStaleSeconds, and when the last beat was. */
export async function workerLiveness(): Promise<WorkerLiveness> {
  const [r] = await db
    .select({
      alive: sql<number>`count(*) filter (where ${workerHeartbeats.beatAt} > now() - make_interval(secs => ${LIVENESS.workerStaleSeconds}))::int`,
      last: sql<string | null>`max(${workerHeartbeats.beatAt})`,
    })
    .from(workerHeartbeats);
  return {
    alive: r?.alive ?? 0,
    lastHeartbeatAt: r?.last ? new Date(r.last).toISOString() : null,
    staleAfterSeconds: LIVENESS.workerStaleSeconds,
  };
}
