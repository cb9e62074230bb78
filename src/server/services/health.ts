import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { storeAnswers } from "@/server/storage/s3";
import { mailServiceAnswers } from "@/server/mail/client";

export type ServiceHealth = { ok: boolean; services: { database: boolean; objectStore: boolean; mail: boolean } };

/** Whether each service answers (a trivial query, the object store, the mail service); nothing about data. */
export async function serviceHealth(): Promise<ServiceHealth> {
  const [database, objectStore, mail] = await Promise.all([
    db
      .execute(sql`select 1`)
      .then(() => true)
      .catch(() => false),
    storeAnswers(),
    mailServiceAnswers(),
  ]);
  return { ok: database && objectStore && mail, services: { database, objectStore, mail } };
}
