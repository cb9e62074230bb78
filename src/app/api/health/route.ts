import { sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { storeAnswers } from "@/server/storage/s3";
import { mailServiceAnswers } from "@/server/mail/client";
import { json, route } from "@/server/http";

export const dynamic = "force-dynamic";

/** Public on purpose: says only whether each service answers, nothing about data. */
export const GET = route(async () => {
  const [database, objectStore, mail] = await Promise.all([
    db
      .execute(sql`select 1`)
      .then(() => true)
      .catch(() => false),
    storeAnswers(),
    mailServiceAnswers(),
  ]);
  const ok = database && objectStore && mail;
  return json({ ok, services: { database, objectStore, mail } }, ok ? 200 : 503);
});
