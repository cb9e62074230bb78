import "server-only";
import { and, eq, gt, isNull, sql } from "drizzle-orm";
import crypto from "node:crypto";
import { db } from "@/server/db/client";
import { users, passwordResets, invitations, memberships, campaigns } from "@/server/db/schema";
import { hashPassword, verifyPassword } from "@/server/auth/password";
import { newToken, hashToken } from "@/server/auth/tokens";
import { endAllSessions, endOtherSessions } from "@/server/auth/session";
import { beginAttempt, countAttempt } from "./throttle";
import { audit } from "./audit";
import { sendMail } from "@/server/mail/client";
import { AppError } from "@/server/errors";
import { env } from "@/env";
import { roleLabels, type CampaignRole } from "@/lib/roles";
import type { SessionUser } from "@/server/auth/session";

export const INVITE_HOURS = 72;
export const RESET_HOURS = 1;

const findByEmail = (email: string) =>
  db.query.users.findFirst({ where: sql`lower(${users.email}) = ${email.toLowerCase()}` });

/**
 * Checks an e-mail and password. The answer, the time taken and the throttling are the same
 * whether or not the account exists. Only failures count (see throttle.ts): the account's streak
 * from this address, the account's streak from anywhere, and this address's failures.
 */
export async function checkCredentials(email: string, password: string, address: string): Promise<string> {
  const attempt = await beginAttempt([
    { kind: "signin:account-address", key: `${email}|${address}` },
    { kind: "signin:account", key: email },
    { kind: "signin:address", key: address },
  ]);
  const user = await findByEmail(email);
  const ok = await verifyPassword(user?.passwordHash, password);
  if (!user || !ok) throw new AppError("unauthorized", "That e-mail and password do not match an account.");
  await attempt.succeeded();
  return user.id;
}

/** Always answers the same; mails a one-hour link only when the account exists. */
export async function requestPasswordReset(email: string, address: string): Promise<void> {
  await countAttempt([
    { kind: "reset:account", key: email },
    { kind: "reset:address", key: address },
  ]);
  const user = await findByEmail(email);
  if (!user) {
    // Spend about the time a real request spends, so timing says nothing either.
    await new Promise((r) => setTimeout(r, 40 + crypto.randomInt(40)));
    return;
  }
  const { token, hash } = newToken();
  await db
    .insert(passwordResets)
    .values({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_HOURS * 3600_000) });
  const link = `${env.APP_URL}/reset-password/${token}`;
  await sendMail({
    to: user.email,
    subject: "Reset your Inhibitrack password",
    text: `Someone asked to reset the password of your Inhibitrack account.\n\nChoose a new password within ${RESET_HOURS} hour: ${link}\n\nIf it was not you, ignore this message; your password stays as it is.`,
    html: `<p>Someone asked to reset the password of your Inhibitrack account.</p><p><a href="${link}">Choose a new password</a> within ${RESET_HOURS} hour.</p><p>If it was not you, ignore this message; your password stays as it is.</p>`,
  });
}

const invalidResetLink = () =>
  new AppError("bad_request", "This reset link is not valid: it was used already or has expired. Ask for a new one.");

/**
 * Single-use, expiring; spends every outstanding reset link of the user and ends every session of
 * the user. Returns the user id. A link that is not valid is refused before argon2 runs, and such
 * failures count against the address.
 */
export async function resetPassword(token: string, password: string, address: string): Promise<string> {
  const attempt = await beginAttempt([{ kind: "password:address", key: address }]);
  const tokenHash = hashToken(token);
  const live = and(
    eq(passwordResets.tokenHash, tokenHash),
    isNull(passwordResets.usedAt),
    gt(passwordResets.expiresAt, new Date()),
  );
  if (!(await db.query.passwordResets.findFirst({ where: live }))) throw invalidResetLink();
  const passwordHash = await hashPassword(password);
  const userId = await db.transaction(async (tx) => {
    const [row] = await tx
      .update(passwordResets)
      .set({ usedAt: new Date() })
      .where(live)
      .returning({ userId: passwordResets.userId });
    if (!row) throw invalidResetLink();
    await spendResetLinks(tx, row.userId);
    await tx.update(users).set({ passwordHash, passwordChangedAt: new Date() }).where(eq(users.id, row.userId));
    const u = await tx.query.users.findFirst({ where: eq(users.id, row.userId) });
    await audit(tx, u ? { id: u.id, email: u.email } : null, {
      action: "password.reset",
      entityType: "user",
      entityId: row.userId,
    });
    return row.userId;
  });
  await attempt.succeeded();
  await endAllSessions(userId);
  return userId;
}

type Tx = Parameters<Parameters<typeof db.transaction>[0]>[0];

/** Marks every unused reset link of a user as used: a new password makes them all pointless. */
async function spendResetLinks(tx: Tx, userId: string): Promise<void> {
  await tx
    .update(passwordResets)
    .set({ usedAt: new Date() })
    .where(and(eq(passwordResets.userId, userId), isNull(passwordResets.usedAt)));
}

/**
 * Changes the password after checking the current one (throttled like a sign-in: failures of this
 * account and of this address). Spends the user's outstanding reset links and ends every other
 * session; the session that made the change (`keepSessionId`) stays signed in.
 */
export async function changePassword(
  user: SessionUser,
  current: string,
  password: string,
  opts: { address: string; keepSessionId: string | null },
): Promise<void> {
  const attempt = await beginAttempt([
    { kind: "password:account", key: user.id },
    { kind: "password:address", key: opts.address },
  ]);
  const row = await db.query.users.findFirst({ where: eq(users.id, user.id) });
  if (!(await verifyPassword(row?.passwordHash, current)))
    throw new AppError("bad_request", "The current password is not right.");
  await attempt.succeeded();
  const passwordHash = await hashPassword(password);
  await db.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash, passwordChangedAt: new Date() }).where(eq(users.id, user.id));
    await spendResetLinks(tx, user.id);
    await audit(tx, user, { action: "password.change", entityType: "user", entityId: user.id });
  });
  await endOtherSessions(user.id, opts.keepSessionId);
}

export async function invite(
  actor: SessionUser,
  campaignId: string,
  email: string,
  role: CampaignRole,
): Promise<{ id: string; link: string; expiresAt: Date }> {
  const { token, hash } = newToken();
  const expiresAt = new Date(Date.now() + INVITE_HOURS * 3600_000);
  const campaign = await db.query.campaigns.findFirst({ where: eq(campaigns.id, campaignId) });
  if (!campaign) throw new AppError("not_found", "No such campaign.");
  const id = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(invitations)
      .values({
        email,
        campaignId,
        role,
        tokenHash: hash,
        invitedBy: actor.id,
        expiresAt,
      })
      .returning({ id: invitations.id });
    await audit(tx, actor, {
      campaignId,
      action: "invitation.create",
      entityType: "invitation",
      entityId: row!.id,
      after: { email, role },
    });
    return row!.id;
  });
  const link = `${env.APP_URL}/invite/${token}`;
  await sendMail({
    to: email,
    subject: `You are invited to ${campaign.name} on Inhibitrack`,
    text: `${actor.name} invited you to the campaign "${campaign.name}" (target: ${campaign.targetEnzyme}) as ${roleLabels[role]}.\n\nAccept within ${INVITE_HOURS} hours: ${link}\n\nThe link works once.`,
    html: `<p>${escapeHtml(actor.name)} invited you to the campaign <b>${escapeHtml(campaign.name)}</b> (target: ${escapeHtml(campaign.targetEnzyme)}) as ${roleLabels[role]}.</p><p><a href="${link}">Accept the invitation</a> within ${INVITE_HOURS} hours. The link works once.</p>`,
  });
  return { id, link, expiresAt };
}

export async function findInvitation(token: string) {
  const [row] = await db
    .select({ inv: invitations, campaignName: campaigns.name })
    .from(invitations)
    .innerJoin(campaigns, eq(campaigns.id, invitations.campaignId))
    .where(
      and(
        eq(invitations.tokenHash, hashToken(token)),
        isNull(invitations.usedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, new Date()),
      ),
    );
  return row ?? null;
}

/** Whether an account exists for this address (case-insensitive): the invitation page asks for a password only then. */
export async function hasAccount(email: string): Promise<boolean> {
  return Boolean(await findByEmail(email));
}

/**
 * Accepts an invitation: a new account (name + password), or, when the address already has an
 * account, that account's password. Single use: the token is spent in the same transaction.
 */
export async function acceptInvitation(
  token: string,
  input: { name?: string; password: string },
  address: string,
): Promise<string> {
  const addressAttempt = await beginAttempt([{ kind: "password:address", key: address }]);
  const found = await findInvitation(token);
  if (!found)
    throw new AppError(
      "bad_request",
      "This invitation is not valid: it was used already, was withdrawn or has expired.",
    );
  const existing = await findByEmail(found.inv.email);
  let passwordHash: string | null = null;
  if (existing) {
    const accountAttempt = await beginAttempt([{ kind: "password:account", key: existing.id }]);
    if (!(await verifyPassword(existing.passwordHash, input.password)))
      throw new AppError("bad_request", "That is not the password of the existing account for this address.");
    await accountAttempt.succeeded();
  } else {
    if (!input.name) throw new AppError("bad_request", "Enter your name.");
    if (input.password.length < 10) throw new AppError("bad_request", "Use a password of at least 10 characters.");
    passwordHash = await hashPassword(input.password);
  }
  await addressAttempt.succeeded();
  return db.transaction(async (tx) => {
    const [spent] = await tx
      .update(invitations)
      .set({ usedAt: new Date() })
      .where(and(eq(invitations.id, found.inv.id), isNull(invitations.usedAt)))
      .returning({ id: invitations.id });
    if (!spent) throw new AppError("bad_request", "This invitation was used already.");
    let userId = existing?.id;
    if (!userId) {
      userId = crypto.randomUUID();
      await tx.insert(users).values({ id: userId, email: found.inv.email, name: input.name!, passwordHash });
    }
    await tx
      .insert(memberships)
      .values({ campaignId: found.inv.campaignId, userId, role: found.inv.role })
      .onConflictDoUpdate({ target: [memberships.campaignId, memberships.userId], set: { role: found.inv.role } });
    await audit(
      tx,
      { id: userId, email: found.inv.email },
      {
        campaignId: found.inv.campaignId,
        action: "invitation.accept",
        entityType: "membership",
        entityId: userId,
        after: { role: found.inv.role },
      },
    );
    return userId;
  });
}

function escapeHtml(s: string) {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}
