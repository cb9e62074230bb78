// Accounts against the real Postgres and the e-mail fake: throttling, single-use expiring
// tokens, sessions ended on password change and removal, no account enumeration (common
// practice: OWASP Authentication and Forgot Password cheat sheets, from memory).
import { describe, it, expect } from "vitest";
import { eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { passwordResets, invitations, memberships, users, auditLog } from "@/server/db/schema";
import { createSessionId, validateSessionToken, sessionIdOf } from "@/server/auth/session";
import { sessions } from "@/server/db/schema";
import { makeWorld, newTestUser, callAction, callRoute, outbox, linkIn, TEST_PASSWORD, as } from "@/test/harness";
import * as authActions from "@/app/(auth)/actions";
import * as settingsActions from "@/app/(workspace)/settings/actions";
import * as teamActions from "@/app/(workspace)/campaigns/[campaignId]/team/actions";
import * as me from "@/app/api/me/route";
import * as health from "@/app/api/health/route";
import { checkCredentials } from "./accounts";
import { rules, streakDelaySeconds } from "./throttle";
import { clientAddress } from "@/server/auth/guard";
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

  it("lets a person sign in 9 times in 15 minutes: successes are not counted", async () => {
    const u = await newTestUser("often");
    for (let i = 0; i < 9; i++) expect(await attempt(u.email, TEST_PASSWORD, "192.0.2.10")).toBe("ok");
    // A typo between successes does not add up either: the success clears the streak.
    for (let i = 0; i < 3; i++) {
      expect(await attempt(u.email, "typo", "192.0.2.10")).toMatch(/^unauthorized/);
      expect(await attempt(u.email, TEST_PASSWORD, "192.0.2.10")).toBe("ok");
    }
    const rows = await db.execute<{ n: number }>(
      sql`select count(*)::int as n from throttle where bucket like ${`signin:account%${u.email}%`}`,
    );
    expect(rows[0]!.n).toBe(0);
  });

  it("two people at one address do not lock each other out", async () => {
    const a = await newTestUser("office-a");
    const b = await newTestUser("office-b");
    const office = "192.0.2.20";
    for (let i = 0; i < 8; i++) expect(await attempt(a.email, "forgot it", office)).toMatch(/^unauthorized|^throttled/);
    expect(await attempt(b.email, TEST_PASSWORD, office)).toBe("ok");
  });

  it("a stranger's 8 wrong passwords delay the owner for a bounded time only, and not at all from the owner's own address", async () => {
    const u = await newTestUser("victim");
    const stranger = "198.51.100.66";
    const outcomes: string[] = [];
    for (let i = 0; i < 8; i++) {
      outcomes.push(await attempt(u.email, `guess ${i}`, stranger));
      // The stranger waits out each delay (moved into the past here instead of waiting).
      await db.execute(
        sql`update throttle set last_at = last_at - interval '10 minutes' where bucket like ${`%${u.email}%`}`,
      );
    }
    expect(outcomes.every((o) => o.startsWith("unauthorized"))).toBe(true);
    // From the owner's own address: straight in.
    expect(await attempt(u.email, TEST_PASSWORD, "192.0.2.30")).toBe("ok");

    // From the stranger's address (say a shared network), the eighth failure, had it been just now,
    // asks for a wait of 2 · 2^(8−5) = 16 s (throttle.ts), after which the right password works.
    const pair = sql`lower(${`signin:account-address:${u.email}|${stranger}`})`;
    await db.execute(sql`update throttle set last_at = now() where bucket = ${pair}`);
    const waiting = await attempt(u.email, TEST_PASSWORD, stranger);
    expect(waiting).toMatch(/^throttled: Too many failed attempts\. Try again in 1[0-6] seconds\./);
    await db.execute(sql`update throttle set last_at = last_at - interval '17 seconds' where bucket = ${pair}`);
    expect(await attempt(u.email, TEST_PASSWORD, stranger)).toBe("ok");
  });

  it("never asks for more than 5 minutes, however long the streak, and says the same for an unknown account", async () => {
    const u = await newTestUser("long-streak");
    const ghost = `ghost-${Date.now()}@test.invalid`;
    const address = "192.0.2.40";
    for (const email of [u.email, ghost])
      await db.execute(sql`insert into throttle (bucket, window_start, count, last_at)
        values (${`signin:account-address:${email}|${address}`}, '1970-01-01T00:00:00Z', 1000, now())`);
    const a = await attempt(u.email, TEST_PASSWORD, address);
    const b = await attempt(ghost, TEST_PASSWORD, address);
    expect(a).toBe("throttled: Too many failed attempts. Try again in 5 minutes.");
    expect(b).toBe(a);
    expect(streakDelaySeconds("signin:account-address", 1000)).toBe(300);
    expect([4, 5, 6, 7].map((n) => streakDelaySeconds("signin:account-address", n))).toEqual([0, 2, 4, 8]);
  });

  it("lets only the free attempts through when many arrive at once", async () => {
    const u = await newTestUser("parallel");
    const out = await Promise.all(Array.from({ length: 12 }, (_, i) => attempt(u.email, `p${i}`, "192.0.2.50")));
    expect(out.filter((o) => o.startsWith("unauthorized")).length).toBe(5);
    expect(out.filter((o) => o.startsWith("throttled")).length).toBe(7);
  });

  it("limits failures per address, and a rotating X-Forwarded-For from an untrusted peer does not escape it", async () => {
    const peer = `198.18.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}`;
    const addressOf = (i: number) =>
      as(null, () => clientAddress(), { "x-forwarded-for": `10.${i}.0.1, 172.16.0.${i}`, "x-inhibitrack-peer": peer });
    expect(await addressOf(1)).toBe(peer);
    // Bring the address near its limit (the loop of 300 argon2 checks is replaced by the counter itself).
    await db.execute(sql`insert into throttle (bucket, window_start, count, last_at)
      values (${`signin:address:${peer}`}, to_timestamp(floor(extract(epoch from now()) / 900) * 900), ${rules["signin:address"].limit - 2}, now())
      on conflict (bucket, window_start) do update set count = excluded.count`);
    expect(await attempt(`spray-1-${peer}@test.invalid`, "x", await addressOf(2))).toMatch(/^unauthorized/);
    expect(await attempt(`spray-2-${peer}@test.invalid`, "x", await addressOf(3))).toMatch(/^unauthorized/);
    expect(await attempt(`spray-3-${peer}@test.invalid`, "x", await addressOf(4))).toMatch(
      /^throttled: Too many failed attempts\. Try again in \d+ (seconds|minutes)\./,
    );
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
    await callAction(authActions.requestResetAction, { email: u.email }, null);
    const [mail, mail2] = (await outbox()).slice(before).filter((m) => m.to[0] === u.email);
    const token = linkIn(mail!.text, "/reset-password/")!;
    const otherToken = linkIn(mail2!.text, "/reset-password/")!;
    expect(token).toBeTruthy();
    expect(otherToken).not.toBe(token);
    // Only the hash is stored.
    const rows = await db.select().from(passwordResets).where(eq(passwordResets.userId, u.id));
    expect(rows[0]!.tokenHash).not.toContain(token);
    expect(rows[0]!.expiresAt.getTime() - rows[0]!.createdAt.getTime()).toBeLessThanOrEqual(3600_000 + 1000);

    const first = await callAction(authActions.resetPasswordAction, { token, password: "a brand new password" }, null);
    expect(first).toEqual({ kind: "redirect", to: "/campaigns" });
    expect((await validateSessionToken(s1)).session).toBeNull();
    expect((await validateSessionToken(s2)).session).toBeNull();
    const again = await callAction(authActions.resetPasswordAction, { token, password: "yet another password" }, null);
    expect(again.kind === "state" && again.state && !again.state.ok && again.state.error).toMatch(
      /used already or has expired/,
    );
    // The other outstanding link was spent by the reset too.
    const other = await callAction(
      authActions.resetPasswordAction,
      { token: otherToken, password: "yet another one" },
      null,
    );
    expect(other.kind === "state" && other.state && !other.state.ok && other.state.error).toMatch(/used already/);
    expect(await attempt(u.email, "a brand new password", "192.0.2.60")).toBe("ok");
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
  it("ends the user's other sessions and spends outstanding reset links when the password changes, keeping this session", async () => {
    const u = await newTestUser("change");
    const other = await createSessionId(u.id);
    const before = (await outbox()).length;
    await callAction(authActions.requestResetAction, { email: u.email }, null);
    const resetToken = linkIn(
      (await outbox()).slice(before).find((m) => m.to[0] === u.email)!.text,
      "/reset-password/",
    )!;
    const o = await callAction(
      settingsActions.changePasswordAction,
      { current: TEST_PASSWORD, password: "a new long password" },
      u,
    );
    expect(o).toEqual({ kind: "redirect", to: "/settings?changed=1" });
    expect((await validateSessionToken(other)).session).toBeNull();
    // The session that made the change (the harness's own) is the one left.
    const left = await db.select().from(sessions).where(eq(sessions.userId, u.id));
    expect(left).toHaveLength(1);
    const late = await callAction(
      authActions.resetPasswordAction,
      { token: resetToken, password: "an old link's password" },
      null,
    );
    expect(late.kind === "state" && late.state && !late.state.ok && late.state.error).toMatch(/used already/);
  });

  it("throttles guesses of the current password", async () => {
    const u = await newTestUser("change-guess");
    const outs: string[] = [];
    for (let i = 0; i < 7; i++) {
      const o = await callAction(
        settingsActions.changePasswordAction,
        { current: `guess ${i}`, password: "a new long password" },
        u,
      );
      outs.push(o.kind === "state" && o.state && !o.state.ok ? o.state.error : o.kind);
    }
    expect(outs.slice(0, 5).every((e) => /not right/.test(e))).toBe(true);
    expect(outs[5]).toMatch(/Too many failed attempts/);
  });

  it("stores only the SHA-256 of the session cookie's token", async () => {
    const u = await newTestUser("hashed-session");
    const token = await createSessionId(u.id);
    const rows = await db.select().from(sessions).where(eq(sessions.userId, u.id));
    expect(rows.map((r) => r.id)).toEqual([sessionIdOf(token)]);
    expect(rows[0]!.id).not.toContain(token);
    // Reference: Node's crypto SHA-256 of the token (FIPS 180-4), as hex.
    const { createHash } = await import("node:crypto");
    expect(rows[0]!.id).toBe(createHash("sha256").update(token).digest("hex"));
    expect((await validateSessionToken(token)).user?.id).toBe(u.id);
    // The stored id is not itself a usable cookie value.
    expect((await validateSessionToken(rows[0]!.id)).session).toBeNull();
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
    expect((await validateSessionToken(s)).session).toBeNull();
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
    // The worker's own liveness is checked with real worker processes in worker-liveness.int.test.ts.
    expect(r.json).toMatchObject({ services: { database: true, objectStore: true, mail: true } });
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
