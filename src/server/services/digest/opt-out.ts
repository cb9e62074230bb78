import "server-only";
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import { db } from "@/server/db/client";
import { digestOptOuts, users } from "@/server/db/schema";
import { env } from "@/env";
import { audit } from "../audit";

/** How long a stop link in a digest works (common practice: about two digest months). */
export const OPT_OUT_LINK_DAYS = 60;

/** Where a local installation keeps its generated link secret (inside the git-ignored .local folder). */
export const LOCAL_SECRET_FILE = path.join(process.cwd(), ".local", "link-secret");

let cachedSecret: string | null = null;

/**
 * The signing secret: LINK_SIGNING_SECRET, required in production mode; elsewhere one made at
 * random the first time it is needed and kept (mode 0600) in .local/link-secret, so every process
 * of this installation signs alike and no two installations share a secret. Created with O_EXCL
 * so two processes starting together agree on one.
 */
function secret(): string {
  if (env.LINK_SIGNING_SECRET) return env.LINK_SIGNING_SECRET;
  if (env.INHIBITRACK_MODE === "production") throw new Error("LINK_SIGNING_SECRET must be set in production mode.");
  if (cachedSecret) return cachedSecret;
  fs.mkdirSync(path.dirname(LOCAL_SECRET_FILE), { recursive: true });
  try {
    fs.writeFileSync(LOCAL_SECRET_FILE, crypto.randomBytes(32).toString("base64url"), { flag: "wx", mode: 0o600 });
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== "EEXIST") throw e;
  }
  const s = fs.readFileSync(LOCAL_SECRET_FILE, "utf8").trim();
  if (s.length < 32) throw new Error(`${LOCAL_SECRET_FILE} holds no usable secret; delete it to make a new one.`);
  cachedSecret = s;
  return s;
}

const sign = (payload: string) => crypto.createHmac("sha256", secret()).update(payload).digest("base64url");

/**
 * A token naming one person and one campaign, signed (HMAC-SHA-256) so it cannot be altered to
 * name another, and expiring after OPT_OUT_LINK_DAYS.
 */
export function optOutToken(userId: string, campaignId: string, now = new Date()): string {
  const e = Math.floor(now.getTime() / 1000) + OPT_OUT_LINK_DAYS * 86_400;
  const payload = Buffer.from(JSON.stringify({ u: userId, c: campaignId, p: "digest-opt-out", e })).toString(
    "base64url",
  );
  return `${payload}.${sign(payload)}`;
}

/** What a token's payload must hold: a person, a campaign, this purpose and an expiry (Unix seconds). */
const tokenPayload = z.object({
  u: z.string().min(1).max(100),
  c: z.string().uuid(),
  p: z.literal("digest-opt-out"),
  e: z.number().int().positive(),
});

/** The person and campaign of a validly signed, unexpired token; null otherwise. */
export function readOptOutToken(token: string, now = new Date()): { userId: string; campaignId: string } | null {
  const [payload, sig, extra] = token.split(".");
  if (!payload || !sig || extra !== undefined) return null;
  const expected = sign(payload);
  if (sig.length !== expected.length || !crypto.timingSafeEqual(Buffer.from(sig), Buffer.from(expected))) return null;
  try {
    const v = tokenPayload.safeParse(JSON.parse(Buffer.from(payload, "base64url").toString("utf8")));
    if (!v.success || v.data.e * 1000 <= now.getTime()) return null;
    return { userId: v.data.u, campaignId: v.data.c };
  } catch {
    return null;
  }
}

export async function optOut(userId: string, campaignId: string, via: "link" | "settings"): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.insert(digestOptOuts).values({ userId, campaignId, via }).onConflictDoNothing();
    const [u] = await tx.select({ email: users.email }).from(users).where(eq(users.id, userId));
    await audit(tx, u ? { id: userId, email: u.email } : null, {
      campaignId,
      action: "digest.opt_out",
      entityType: "user",
      entityId: userId,
      after: { via },
    });
  });
}

export async function optIn(userId: string, campaignId: string): Promise<void> {
  await db.transaction(async (tx) => {
    await tx
      .delete(digestOptOuts)
      .where(and(eq(digestOptOuts.userId, userId), eq(digestOptOuts.campaignId, campaignId)));
    const [u] = await tx.select({ email: users.email }).from(users).where(eq(users.id, userId));
    await audit(tx, u ? { id: userId, email: u.email } : null, {
      campaignId,
      action: "digest.opt_in",
      entityType: "user",
      entityId: userId,
    });
  });
}

export async function optOutsOf(userId: string): Promise<Set<string>> {
  const rows = await db
    .select({ c: digestOptOuts.campaignId })
    .from(digestOptOuts)
    .where(eq(digestOptOuts.userId, userId));
  return new Set(rows.map((r) => r.c));
}
