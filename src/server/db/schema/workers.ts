import { pgTable, text, timestamp, integer, uuid } from "drizzle-orm/pg-core";

/**
 * One row per running background worker process (src/cli/worker.ts), beaten every ~10 s;
 * /api/health calls the worker down when no row has beaten recently. A process that stops
 * gracefully deletes its row; a killed one leaves a stale row (pruned after a day).
 */
export const workerHeartbeats = pgTable("worker_heartbeats", {
  id: uuid("id").primaryKey(),
  host: text("host").notNull(),
  pid: integer("pid").notNull(),
  startedAt: timestamp("started_at", { withTimezone: true }).notNull().defaultNow(),
  beatAt: timestamp("beat_at", { withTimezone: true }).notNull().defaultNow(),
});
