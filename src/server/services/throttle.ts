import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { AppError } from "@/server/errors";

export const WINDOW_MINUTES = 15;

/** Limits per window of 15 minutes (common practice: a handful per account, more per address). */
export const limits = {
  "signin:account": 8,
  "signin:address": 40,
  "reset:account": 3,
  "reset:address": 20,
} as const;
export type ThrottleKind = keyof typeof limits;

/**
 * Counts an attempt in Postgres (so the limit holds across processes and restarts) and refuses
 * it when the window's count is over the limit. Every bucket is counted before any is checked,
 * and the refusal reads the same whether or not the account exists.
 */
export async function countAttempt(buckets: { kind: ThrottleKind; key: string }[]): Promise<void> {
  let over = false;
  for (const b of buckets) {
    const bucket = `${b.kind}:${b.key.toLowerCase()}`;
    const rows = await db.execute<{ count: number }>(sql`
      insert into throttle (bucket, window_start, count)
      values (${bucket}, to_timestamp(floor(extract(epoch from now()) / ${WINDOW_MINUTES * 60}) * ${WINDOW_MINUTES * 60}), 1)
      on conflict (bucket, window_start) do update set count = throttle.count + 1
      returning count`);
    if ((rows[0]?.count ?? 0) > limits[b.kind]) over = true;
  }
  if (over) throw new AppError("throttled", `Too many attempts. Please wait ${WINDOW_MINUTES} minutes and try again.`);
}

/** Old windows are useless; deleted opportunistically. */
export async function pruneThrottle(): Promise<void> {
  await db.execute(sql`delete from throttle where window_start < now() - interval '1 day'`);
}
