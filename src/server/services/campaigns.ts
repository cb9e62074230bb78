import "server-only";
import { and, asc, desc, eq, gt, isNull, sql, type SQL } from "drizzle-orm";
import { db } from "@/server/db/client";
import { containsPattern } from "@/server/db/sql-helpers";
import { campaigns, memberships, users, invitations, auditLog } from "@/server/db/schema";
import { audit } from "./audit";
import { endAllSessions, type SessionUser } from "@/server/auth/session";
import type { Actor } from "@/server/auth/actor";
import { AppError } from "@/server/errors";
import type { CampaignRole } from "@/lib/roles";
import type { z } from "zod";
import type { campaignSchema } from "@/lib/validation/auth";

export type CampaignInput = z.infer<typeof campaignSchema>;
export type Campaign = typeof campaigns.$inferSelect;
export type Thresholds = { qcMinZPrime: number; qcMaxCvPct: number; hitThresholdPct: number };

/** The campaigns a user may see with their role in each (admins see all; role null where not a member). */
export async function campaignsFor(user: SessionUser) {
  const rows = await db
    .select({
      id: campaigns.id,
      name: campaigns.name,
      targetEnzyme: campaigns.targetEnzyme,
      role: memberships.role,
      createdAt: campaigns.createdAt,
    })
    .from(campaigns)
    .leftJoin(memberships, and(eq(memberships.campaignId, campaigns.id), eq(memberships.userId, user.id)))
    .where(user.globalRole === "admin" ? undefined : sql`${memberships.userId} is not null`)
    .orderBy(asc(campaigns.name));
  return rows;
}

export async function createCampaign(actor: SessionUser, input: CampaignInput): Promise<string> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(campaigns)
      .values({
        name: input.name,
        targetEnzyme: input.targetEnzyme,
        substrate: input.substrate || null,
        kmValue: input.kmValue ?? null,
        kmUnit: input.kmValue ? input.kmUnit : null,
        enzymeConcValue: input.enzymeConcValue ?? null,
        enzymeConcUnit: input.enzymeConcValue ? input.enzymeConcUnit : null,
        assayNotes: input.assayNotes || null,
        qcMinZPrime: input.qcMinZPrime,
        qcMaxCvPct: input.qcMaxCvPct,
        timeZone: input.timeZone,
        createdBy: actor.id,
      })
      .returning();
    await audit(tx, actor, {
      campaignId: row!.id,
      action: "campaign.create",
      entityType: "campaign",
      entityId: row!.id,
      after: row,
    });
    return row!.id;
  });
}

/**
 * A campaign's members with what a person needs to manage them (id, e-mail): for leads and admins
 * only. Everyone else gets `memberNamesOf`.
 */
export async function membersOf(campaignId: string) {
  return db
    .select({
      userId: users.id,
      email: users.email,
      name: users.name,
      role: memberships.role,
      addedAt: memberships.addedAt,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.campaignId, campaignId))
    .orderBy(asc(users.name));
}

/** Names, roles and since when, without e-mails or ids: what any member may see of the team. */
export async function memberNamesOf(campaignId: string) {
  return db
    .select({ name: users.name, role: memberships.role, addedAt: memberships.addedAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.campaignId, campaignId))
    .orderBy(asc(users.name));
}

export async function pendingInvitations(campaignId: string) {
  return db
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      createdAt: invitations.createdAt,
    })
    .from(invitations)
    .where(
      and(
        eq(invitations.campaignId, campaignId),
        isNull(invitations.usedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, new Date()),
      ),
    )
    .orderBy(desc(invitations.createdAt));
}

export async function addMember(
  actor: SessionUser,
  campaignId: string,
  userId: string,
  role: CampaignRole,
): Promise<void> {
  await db.transaction(async (tx) => {
    await tx
      .insert(memberships)
      .values({ campaignId, userId, role })
      .onConflictDoUpdate({ target: [memberships.campaignId, memberships.userId], set: { role } });
    await audit(tx, actor, {
      campaignId,
      action: "membership.add",
      entityType: "membership",
      entityId: userId,
      after: { role },
    });
  });
}

export async function changeRole(
  actor: SessionUser,
  campaignId: string,
  userId: string,
  role: CampaignRole,
): Promise<void> {
  await db.transaction(async (tx) => {
    const [before] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.campaignId, campaignId), eq(memberships.userId, userId)))
      .for("update");
    if (!before) throw new AppError("not_found", "That person is not a member of this campaign.");
    await tx
      .update(memberships)
      .set({ role })
      .where(and(eq(memberships.campaignId, campaignId), eq(memberships.userId, userId)));
    await audit(tx, actor, {
      campaignId,
      action: "membership.role",
      entityType: "membership",
      entityId: userId,
      before: { role: before.role },
      after: { role },
    });
  });
}

/** Removal ends the person's sessions, so a page left open cannot keep acting for them. */
export async function removeMember(actor: SessionUser, campaignId: string, userId: string): Promise<void> {
  await db.transaction(async (tx) => {
    const [before] = await tx
      .delete(memberships)
      .where(and(eq(memberships.campaignId, campaignId), eq(memberships.userId, userId)))
      .returning();
    if (!before) throw new AppError("not_found", "That person is not a member of this campaign.");
    await audit(tx, actor, {
      campaignId,
      action: "membership.remove",
      entityType: "membership",
      entityId: userId,
      before: { role: before.role },
    });
  });
  await endAllSessions(userId);
}

/** A lead changes the campaign's QC and hit thresholds (audited with the values before). */
export async function updateThresholds(actor: Actor, campaign: Campaign, t: Thresholds): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.update(campaigns).set(t).where(eq(campaigns.id, campaign.id));
    await audit(tx, actor, {
      campaignId: campaign.id,
      action: "campaign.thresholds",
      entityType: "campaign",
      entityId: campaign.id,
      before: {
        qcMinZPrime: campaign.qcMinZPrime,
        qcMaxCvPct: campaign.qcMaxCvPct,
        hitThresholdPct: campaign.hitThresholdPct,
      },
      after: t,
    });
  });
}

/** Every campaign's id and name (the admin's audit filter). */
export async function campaignNames(): Promise<{ id: string; name: string }[]> {
  return db.select({ id: campaigns.id, name: campaigns.name }).from(campaigns);
}

export type AuditFilter = { campaignId?: string; action?: string; actor?: string; limit: number; offset: number };

export async function auditEntries(f: AuditFilter) {
  const conds: SQL[] = [];
  if (f.campaignId) conds.push(eq(auditLog.campaignId, f.campaignId));
  if (f.action) conds.push(sql`${auditLog.action} ilike ${containsPattern(f.action)}`);
  if (f.actor) conds.push(sql`${auditLog.actorEmail} ilike ${containsPattern(f.actor)}`);
  const where = conds.length ? and(...conds) : undefined;
  const [items, [total]] = await Promise.all([
    db
      .select({ log: auditLog, campaignName: campaigns.name })
      .from(auditLog)
      .leftJoin(campaigns, eq(campaigns.id, auditLog.campaignId))
      .where(where)
      .orderBy(desc(auditLog.at), desc(auditLog.id))
      .limit(f.limit)
      .offset(f.offset),
    db
      .select({ n: sql<number>`count(*)::int` })
      .from(auditLog)
      .where(where),
  ]);
  return { items, total: total?.n ?? 0 };
}
