import "server-only";
import crypto from "node:crypto";
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import { db } from "@/server/db/client";
import { digestOptOuts, users } from "@/server/db/schema";
import { env } from "@/env";
import { audit } from "../audit";

function secret(): string {
  if (env.LINK_SIGNING_SECRET) return env.LINK_SIGNING_SECRET;
  if (env.INHIBITRACK_MODE === "production") throw new Error("LINK_SIGNING_SECRET must be set in production mode.");
  return "inhibitrack-local-development-link-secret";
}

const sign = (payload: string) => crypto.createHmac("sha256", secret()).update(payload).digest("base64url");

/** A token naming one person and one campaign, signed so it cannot be altered to name another. */
export function optOutToken(userId: string, campaignId: string): string {
  const payload = Buffer.from(JSON.stringify({ u: userId, c: campaignId, p: "digest-opt-out" })).toString("base64url");
  return `${payload}.${sign(payload)}`;
}

/** What a token's payload must hold: a person, a campaign and this purpose. */
const tokenPayload = z.object({ u: z.string().min(1), c: z.string().min(1), p: z.literal("digest-opt-out") });

export function readOptOutToken(token: string): { userId: string; campaignId: string } | null {
  const [payload, sig] = token.split(".");
  if (!payload || !sig) return null;
  const expected = sign(payload);
  if (sig.length !== expected.length || !crypto.timingSafeEqual(Buffer.from(sig), Buffer.from(expected))) return null;
  try {
    const v = tokenPayload.safeParse(JSON.parse(Buffer.from(payload, "base64url").toString("utf8")));
    return v.success ? { userId: v.data.u, campaignId: v.data.c } : null;
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
