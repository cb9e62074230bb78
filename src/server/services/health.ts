import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { storeAnswers } from "@/server/storage/s3";
import { mailServiceAnswers } from "@/server/mail/client";
import { workerLiveness, type WorkerLiveness } from "@/server/jobs/heartbeat";

export type ServiceHealth = {
  ok: boolean;
  services: { database: boolean; objectStore: boolean; mail: boolean; worker: boolean };
  /** The background workers' own heartbeats (null when the database does not answer). */
  worker: WorkerLiveness | null;
};

/**
 * Whether each service answers (a trivial query, the object store, the mail service) and whether
 * a background worker has beaten recently (without one, analyses and digests wait); nothing
 * about data.
 */
export async function serviceHealth(): Promise<ServiceHealth> {
  const [database, objectStore, mail, worker] = await Promise.all([
    db
      .execute(sql`select 1`)
      .then(() => true)
      .catch(() => false),
    storeAnswers(),
    mailServiceAnswers(),
    workerLiveness().catch(() => null),
  ]);
  const workerUp = !!worker && worker.alive > 0;
  return {
    ok: database && objectStore && mail && workerUp,
    services: { database, objectStore, mail, worker: workerUp },
    worker,
  };
}
