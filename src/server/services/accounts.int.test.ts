// Accounts against the real Postgres and the e-mail fake: throttling, single-use expiring
// tokens, sessions ended on password change and removal, no account enumeration (common
// practice: OWASP Authentication and Forgot Password cheat sheets, from memory).
import { describe, it, expect } from "vitest";
import { eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { passwordResets, invitations, memberships, users, auditLog } from "@/server/db/schema";
import { lucia } from "@/server/auth/lucia";
import { createSessionId } from "@/server/auth/session";
import { makeWorld, newTestUser, callAction, callRoute, outbox, linkIn, TEST_PASSWORD, as } from "@/test/harness";
import * as authActions from "@/app/(auth)/actions";
import * as settingsActions from "@/app/(workspace)/settings/actions";
import * as teamActions from "@/app/(workspace)/campaigns/[campaignId]/team/actions";
import * as me from "@/app/api/me/route";
import * as health from "@/app/api/health/route";
import { checkCredentials } from "./accounts";
import { AppError } from "@/server/errors";

const signIn = (email: string, password: string) => callAction(authActions.signInAction, { email, password }, null);

async function attempt(email: string, password: string, address: string): Promise<string> {
  try {
    await checkCredentials(email, password, address);
    return "ok";
  } catch (e) {
    return e instanceof AppError ? `${e.code}: ${e.message}` : String(e);
  }
}

describe("sign-in", () => {
  it("signs in with the right password and refuses a wrong one with the same words as an unknown address", async () => {
    const u = await newTestUser("signin");
    const ok = await signIn(u.email, TEST_PASSWORD);
    expect(ok).toEqual({ kind: "redirect", to: "/campaigns" });
    const wrong = await signIn(u.email, "not the password");
    const unknown = await signIn(`nobody-${Date.now()}@test.invalid`, "not the password");
    expect(wrong.kind).toBe("state");
    expect(wrong).toEqual(unknown);
  });

  it("throttles an account after 8 attempts in 15 minutes, even with the right password, and says the same for an unknown account", async () => {
    const u = await newTestUser("throttle");
    const ghost = `ghost-${Date.now()}@test.invalid`;
    for (let i = 0; i < 8; i++) {
      expect(await attempt(u.email, "wrong", `192.0.2.${i}`)).toMatch(/^unauthorized/);
      expect(await attempt(ghost, "wrong", `192.0.2.${i}`)).toMatch(/^unauthorized/);
    }
    const a = await attempt(u.email, TEST_PASSWORD, "192.0.2.200");
    const b = await attempt(ghost, TEST_PASSWORD, "192.0.2.200");
    expect(a).toMatch(/^throttled: Too many attempts/);
    expect(a).toBe(b);
    // Kept in Postgres: a new process would read the same counter.
    const [row] = await db.execute<{ count: number }>(
      sql`select max(count)::int as count from throttle where bucket = ${`signin:account:${u.email}`}`,
    );
    expect(row!.count).toBeGreaterThanOrEqual(9);
  });

  it("throttles a client address after 40 attempts across accounts", async () => {
    const address = `198.18.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}`;
    for (let i = 0; i < 40; i++)
      expect(await attempt(`spray-${i}-${address}@test.invalid`, "x", address)).toMatch(/^unauthorized/);
    expect(await attempt(`spray-last-${address}@test.invalid`, "x", address)).toMatch(/^throttled/);
  });

  it("takes about as long for an unknown address as for a wrong password (no enumeration by timing)", async () => {
    const u = await newTestUser("timing");
    const time = async (email: string, i: number) => {
      const t0 = performance.now();
      await attempt(email, "wrong password", `100.64.${i}.1`);
      return performance.now() - t0;
    };
    const known: number[] = [];
    const unknown: number[] = [];
    for (let i = 0; i < 6; i++) {
      known.push(await time(u.email, i));
      unknown.push(await time(`nobody-${i}-${Date.now()}@test.invalid`, i + 50));
    }
    const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
    const ratio = median(known) / median(unknown);
    expect(ratio).toBeGreaterThan(0.5);
    expect(ratio).toBeLessThan(2);
  });
});

describe("password reset", () => {
  it("answers the same for a known and an unknown address, and mails only the known one", async () => {
    const u = await newTestUser("reset");
    const before = (await outbox()).length;
    const known = await callAction(authActions.requestResetAction, { email: u.email }, null);
    const unknown = await callAction(
      authActions.requestResetAction,
      { email: `nobody-${Date.now()}@test.invalid` },
      null,
    );
    expect(known).toEqual(unknown);
    const mails = (await outbox()).slice(before);
    expect(mails.map((m) => m.to[0])).toEqual([u.email]);
  });

  it("uses a link once, within one hour, and ends every session of the user", async () => {
    const u = await newTestUser("reset2");
    const s1 = await createSessionId(u.id);
    const s2 = await createSessionId(u.id);
    const before = (await outbox()).length;
    await callAction(authActions.requestResetAction, { email: u.email }, null);
    const mail = (await outbox()).slice(before).find((m) => m.to[0] === u.email)!;
    const token = linkIn(mail.text, "/reset-password/")!;
    expect(token).toBeTruthy();
    // Only the hash is stored.
    const rows = await db.select().from(passwordResets).where(eq(passwordResets.userId, u.id));
    expect(rows[0]!.tokenHash).not.toContain(token);
    expect(rows[0]!.expiresAt.getTime() - rows[0]!.createdAt.getTime()).toBeLessThanOrEqual(3600_000 + 1000);

    const first = await callAction(authActions.resetPasswordAction, { token, password: "a brand new password" }, null);
    expect(first).toEqual({ kind: "redirect", to: "/campaigns" });
    expect((await lucia.validateSession(s1)).session).toBeNull();
    expect((await lucia.validateSession(s2)).session).toBeNull();
    const again = await callAction(authActions.resetPasswordAction, { token, password: "yet another password" }, null);
    expect(again.kind === "state" && again.state && !again.state.ok && again.state.error).toMatch(
      /used already or has expired/,
    );
  });

  it("refuses an expired link", async () => {
    const u = await newTestUser("reset3");
    const before = (await outbox()).length;
    await callAction(authActions.requestResetAction, { email: u.email }, null);
    const token = linkIn((await outbox()).slice(before).find((m) => m.to[0] === u.email)!.text, "/reset-password/")!;
    await db
      .update(passwordResets)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(passwordResets.userId, u.id));
    const r = await callAction(authActions.resetPasswordAction, { token, password: "a brand new password" }, null);
    expect(r.kind === "state" && r.state && !r.state.ok && r.state.error).toMatch(/expired/);
  });
});

describe("password change and team removal end sessions", () => {
  it("ends every session of the user when the password changes", async () => {
    const u = await newTestUser("change");
    const other = await createSessionId(u.id);
    const o = await callAction(
      settingsActions.changePasswordAction,
      { current: TEST_PASSWORD, password: "a new long password" },
      u,
    );
    expect(o).toEqual({ kind: "redirect", to: "/settings?changed=1" });
    expect((await lucia.validateSession(other)).session).toBeNull();
  });

  it("ends the sessions of a person removed from a team, and records it in the audit log", async () => {
    const w = await makeWorld();
    const s = await createSessionId(w.people.viewer.id);
    const o = await callAction(
      teamActions.removeMemberAction,
      { campaignId: w.campaignId, userId: w.people.viewer.id },
      w.people.admin,
    );
    expect(o.kind === "state" && o.state?.ok).toBe(true);
    expect((await lucia.validateSession(s)).session).toBeNull();
    const log = await db.select().from(auditLog).where(eq(auditLog.campaignId, w.campaignId));
    expect(log.map((l) => l.action)).toContain("membership.remove");
  });
});

describe("invitations", () => {
  it("creates the account and membership once; the link cannot be used twice or after 72 hours", async () => {
    const w = await makeWorld();
    const email = `new-${w.tag}@test.invalid`;
    const before = (await outbox()).length;
    const sent = await callAction(
      teamActions.inviteAction,
      { campaignId: w.campaignId, email, role: "chemist" },
      w.people.admin,
    );
    expect(sent.kind === "state" && sent.state?.ok).toBe(true);
    const token = linkIn((await outbox()).slice(before).find((m) => m.to[0] === email)!.text, "/invite/")!;
    const [inv] = await db.select().from(invitations).where(eq(invitations.email, email));
    expect(inv!.expiresAt.getTime() - inv!.createdAt.getTime()).toBeCloseTo(72 * 3600_000, -4);

    const accepted = await callAction(
      authActions.acceptInviteAction,
      { token, name: "New Chemist", password: "their own password" },
      null,
    );
    expect(accepted).toEqual({ kind: "redirect", to: "/campaigns" });
    const [u] = await db.select().from(users).where(eq(users.email, email));
    const [m] = await db.select().from(memberships).where(eq(memberships.userId, u!.id));
    expect(m!.role).toBe("chemist");

    const twice = await callAction(
      authActions.acceptInviteAction,
      { token, name: "Someone", password: "their own password" },
      null,
    );
    expect(twice.kind === "state" && twice.state && !twice.state.ok && twice.state.error).toMatch(/not valid/);

    const email2 = `late-${w.tag}@test.invalid`;
    const b2 = (await outbox()).length;
    await callAction(
      teamActions.inviteAction,
      { campaignId: w.campaignId, email: email2, role: "viewer" },
      w.people.admin,
    );
    const token2 = linkIn((await outbox()).slice(b2).find((m) => m.to[0] === email2)!.text, "/invite/")!;
    await db
      .update(invitations)
      .set({ expiresAt: new Date(Date.now() - 1) })
      .where(eq(invitations.email, email2));
    const late = await callAction(
      authActions.acceptInviteAction,
      { token: token2, name: "Late", password: "their own password" },
      null,
    );
    expect(late.kind === "state" && late.state && !late.state.ok && late.state.error).toMatch(/expired/);
  });
});

describe("campaign visibility and the API", () => {
  it("GET /api/me without a session is 401 JSON; with one it lists only the user's memberships", async () => {
    const w = await makeWorld();
    const out = await callRoute(me.GET, { user: null, path: "/api/me" });
    expect(out.status).toBe(401);
    expect(out.json).toMatchObject({ error: "Please sign in." });
    const v = await callRoute(me.GET, { user: w.people.viewer, path: "/api/me" });
    expect(v.status).toBe(200);
    expect((v.json as { memberships: { campaignId: string; role: string }[] }).memberships).toEqual([
      expect.objectContaining({ campaignId: w.campaignId, role: "viewer" }),
    ]);
  });

  it("refuses a mutating request whose Origin is another site", async () => {
    const { requireSameOrigin } = await import("@/server/auth/guard");
    await expect(
      as(null, () => requireSameOrigin(), { origin: "https://evil.example", host: "127.0.0.1:3000" }),
    ).rejects.toThrow(/another site/);
    await expect(
      as(null, () => requireSameOrigin(), { origin: "http://127.0.0.1:3000", host: "127.0.0.1:3000" }),
    ).resolves.toBeUndefined();
  });

  it("reports the database, object store and e-mail service as up", async () => {
    const r = await callRoute(health.GET, { user: null, path: "/api/health" });
    expect(r.json).toEqual({ ok: true, services: { database: true, objectStore: true, mail: true } });
  });
});

describe("audit log", () => {
  it("is append-only: updates and deletes are refused by the database", async () => {
    const w = await makeWorld();
    await callAction(
      teamActions.changeRoleAction,
      { campaignId: w.campaignId, userId: w.people.viewer.id, role: "chemist" },
      w.people.admin,
    );
    const [row] = await db.select().from(auditLog).where(eq(auditLog.campaignId, w.campaignId));
    expect(row).toBeTruthy();
    await expect(db.update(auditLog).set({ action: "tampered" }).where(eq(auditLog.id, row!.id))).rejects.toThrow();
    await expect(db.delete(auditLog).where(eq(auditLog.id, row!.id))).rejects.toThrow();
  });
});
