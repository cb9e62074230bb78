import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { AppError } from "@/server/errors";

export const WINDOW_MINUTES = 15;

/**
 * Two kinds of counter, both of failures only (a success undoes its own count and clears the
 * streaks it names), so signing in often never counts against anyone:
 *
 * - `streak`: consecutive failures of one account (or one account from one address). The first
 *   `free` failures cost nothing; after that the next attempt waits `baseSeconds · 2^(n − free)`,
 *   capped at `capSeconds` after the latest failure — a growing delay, never a lock a stranger can
 *   hold for long. An attempt refused for its wait is not counted, so waiting always ends.
 * - `window`: failures per fixed 15-minute window (one address), refused over `limit` until the
 *   window ends.
 *
 * Figures are common practice (OWASP Authentication Cheat Sheet's advice of delays over lockout,
 * from memory), chosen so one shared office address (a few dozen people mistyping now and then)
 * stays far below its limit.
 */
export const rules = {
  // One account from one address: the owner's own typos, or a stranger at the same address.
  "signin:account-address": { type: "streak", free: 5, baseSeconds: 2, capSeconds: 300 },
  // One account from anywhere: guessing spread over many addresses.
  "signin:account": { type: "streak", free: 20, baseSeconds: 2, capSeconds: 300 },
  "signin:address": { type: "window", limit: 300 },
  // A signed-in person retyping the current password, or accepting an invitation for an existing account.
  "password:account": { type: "streak", free: 5, baseSeconds: 2, capSeconds: 300 },
  "password:address": { type: "window", limit: 300 },
  // Reset requests send e-mail: every request counts, as before.
  "reset:account": { type: "window", limit: 3 },
  "reset:address": { type: "window", limit: 20 },
} as const satisfies Record<
  string,
  { type: "streak"; free: number; baseSeconds: number; capSeconds: number } | { type: "window"; limit: number }
>;
export type ThrottleKind = keyof typeof rules;
export type Bucket = { kind: ThrottleKind; key: string };

/** Streak rows use this fixed window_start; window rows the start of their 15-minute window. */
const STREAK_WINDOW = "1970-01-01T00:00:00Z";
/** A streak whose latest failure is older than this starts again from zero. */
const STREAK_FORGET = "1 day";

const bucketName = (b: Bucket) => `${b.kind}:${b.key.toLowerCase()}`;

/** The wait after `n` consecutive failures: max(0, min(cap, base · 2^(n − free))) seconds, 0 while n < free. */
export function streakDelaySeconds(kind: ThrottleKind, n: number): number {
  const r = rules[kind];
  if (r.type !== "streak" || n < r.free) return 0;
  return Math.min(r.capSeconds, r.baseSeconds * 2 ** (n - r.free));
}

export type Attempt = {
  /** The attempt succeeded: its counts are undone and the named streaks cleared. */
  succeeded(): Promise<void>;
};

type Claimed = { kind: ThrottleKind; bucket: string; windowStart: string };

class Refused extends Error {
  constructor(readonly waitSeconds: number) {
    super("refused");
  }
}

/**
 * Claims an attempt before the costly check (argon2) runs: each bucket counts it as a failure at
 * once, in one transaction, so parallel requests cannot slip past a limit together. When any
 * bucket refuses, nothing is counted and a `throttled` error says how long to wait; the words are
 * the same whether or not the account exists. Kept in Postgres, so limits hold across processes.
 */
export async function beginAttempt(buckets: Bucket[]): Promise<Attempt> {
  // Old rows are useless; about one attempt in 200 clears them, off the attempt's own path.
  if (Math.random() < 0.005) void pruneThrottle().catch(() => {});
  let claimed: Claimed[];
  try {
    claimed = await db.transaction(async (tx) => {
      const out: Claimed[] = [];
      let wait = 0;
      for (const b of buckets) {
        const r = rules[b.kind];
        const bucket = bucketName(b);
        if (r.type === "streak") {
          const rows = await tx.execute<{ window_start: string | Date }>(sql`
            insert into throttle (bucket, window_start, count, last_at) values (${bucket}, ${STREAK_WINDOW}::timestamptz, 1, now())
            on conflict (bucket, window_start) do update
              set count = case when throttle.last_at < now() - ${STREAK_FORGET}::interval then 1 else throttle.count + 1 end,
                  last_at = now()
              where throttle.count < ${r.free}
                 or throttle.last_at < now() - make_interval(secs => least(${r.capSeconds}::float8,
                      ${r.baseSeconds}::float8 * power(2::float8, (throttle.count - ${r.free})::float8)))
            returning window_start`);
          if (rows[0]) out.push({ kind: b.kind, bucket, windowStart: asText(rows[0].window_start) });
          else {
            const [w] = await tx.execute<{ wait: number }>(sql`
              select ceil(extract(epoch from last_at + make_interval(secs => least(${r.capSeconds}::float8,
                ${r.baseSeconds}::float8 * power(2::float8, (count - ${r.free})::float8))) - now()))::int as wait
              from throttle where bucket = ${bucket} and window_start = ${STREAK_WINDOW}::timestamptz`);
            wait = Math.max(wait, w?.wait ?? 1, 1);
          }
        } else {
          const rows = await tx.execute<{ window_start: string | Date }>(sql`
            insert into throttle (bucket, window_start, count, last_at)
            values (${bucket}, to_timestamp(floor(extract(epoch from now()) / ${WINDOW_MINUTES * 60}) * ${WINDOW_MINUTES * 60}), 1, now())
            on conflict (bucket, window_start) do update set count = throttle.count + 1, last_at = now()
              where throttle.count < ${r.limit}
            returning window_start`);
          if (rows[0]) out.push({ kind: b.kind, bucket, windowStart: asText(rows[0].window_start) });
          else {
            const [w] = await tx.execute<{ wait: number }>(sql`
              select ceil(${WINDOW_MINUTES * 60} - mod(extract(epoch from now())::numeric, ${WINDOW_MINUTES * 60}))::int as wait`);
            wait = Math.max(wait, w?.wait ?? 60);
          }
        }
      }
      if (wait > 0) throw new Refused(wait);
      return out;
    });
  } catch (e) {
    if (e instanceof Refused)
      throw new AppError("throttled", `Too many failed attempts. Try again in ${waitWords(e.waitSeconds)}.`, {
        extra: { retryAfterSeconds: e.waitSeconds },
      });
    throw e;
  }
  return {
    async succeeded() {
      for (const c of claimed) {
        if (rules[c.kind].type === "streak")
          await db.execute(
            sql`delete from throttle where bucket = ${c.bucket} and window_start = ${c.windowStart}::timestamptz`,
          );
        else
          await db.execute(
            sql`update throttle set count = greatest(count - 1, 0) where bucket = ${c.bucket} and window_start = ${c.windowStart}::timestamptz`,
          );
      }
    },
  };
}

const asText = (v: string | Date) => (v instanceof Date ? v.toISOString() : String(v));

function waitWords(s: number): string {
  if (s < 90) return `${s} second${s === 1 ? "" : "s"}`;
  const m = Math.ceil(s / 60);
  return `${m} minutes`;
}

/**
 * Counts a request that is limited whether or not it succeeds (a reset e-mail), refusing it over
 * the window's limit.
 */
export async function countAttempt(buckets: Bucket[]): Promise<void> {
  await beginAttempt(buckets);
}

/** Old windows and forgotten streaks are useless; deleted opportunistically. */
export async function pruneThrottle(): Promise<void> {
  await db.execute(sql`delete from throttle where last_at < now() - interval '1 day'`);
}
