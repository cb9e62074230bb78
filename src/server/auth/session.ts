import "server-only";
import crypto from "node:crypto";
import { cache } from "react";
import { cookies } from "next/headers";
import { and, eq, ne } from "drizzle-orm";
import { db } from "@/server/db/client";
import { sessions } from "@/server/db/schema";
import { lucia } from "./lucia";
import type { GlobalRole } from "@/lib/roles";

export type SessionUser = { id: string; email: string; name: string; globalRole: GlobalRole };
export type CurrentSession = { user: SessionUser; sessionId: string } | { user: null; sessionId: null };

export const SESSION_COOKIE = lucia.sessionCookieName;

/**
 * The cookie carries a random token; the database stores only its SHA-256 (hex) as the session
 * id, so reading the sessions table yields no usable cookie (lucia's current session guidance).
 * 32 random bytes: far beyond guessing, and fast to hash on every request.
 */
export function sessionIdOf(token: string): string {
  return crypto.createHash("sha256").update(token).digest("hex");
}

const newSessionToken = () => crypto.randomBytes(32).toString("base64url");

/** Validates a cookie token: the session (whose id is the token's hash) and its user, or nulls. */
export function validateSessionToken(token: string) {
  return lucia.validateSession(sessionIdOf(token));
}

/** The signed-in user of this request, validated once per request. */
export const getCurrentSession = cache(async (): Promise<CurrentSession> => {
  const jar = await cookies();
  const token = jar.get(lucia.sessionCookieName)?.value ?? null;
  if (!token) return { user: null, sessionId: null };
  const { session, user } = await validateSessionToken(token);
  try {
    // Renew on use; Server Components cannot set cookies, so this only succeeds in actions
    // and route handlers (the proxy extends the cookie on page loads).
    if (session?.fresh) {
      const c = lucia.createSessionCookie(token);
      jar.set(c.name, c.value, c.attributes);
    }
    if (!session) {
      const c = lucia.createBlankSessionCookie();
      jar.set(c.name, c.value, c.attributes);
    }
  } catch {}
  if (!session || !user) return { user: null, sessionId: null };
  return {
    user: { id: user.id, email: user.email, name: user.name, globalRole: user.globalRole },
    sessionId: session.id,
  };
});

/** A new session row (id = SHA-256 of the token); returns the token, the cookie's value. */
async function newSession(userId: string): Promise<string> {
  const token = newSessionToken();
  await lucia.createSession(userId, {}, { sessionId: sessionIdOf(token) });
  return token;
}

export async function startSession(userId: string): Promise<void> {
  const c = lucia.createSessionCookie(await newSession(userId));
  (await cookies()).set(c.name, c.value, c.attributes);
}

export async function endCurrentSession(): Promise<void> {
  const { sessionId } = await getCurrentSession();
  if (sessionId) await lucia.invalidateSession(sessionId);
  const c = lucia.createBlankSessionCookie();
  (await cookies()).set(c.name, c.value, c.attributes);
}

/** Ends every session of a user (password reset, removal from a team). */
export async function endAllSessions(userId: string): Promise<void> {
  await lucia.invalidateUserSessions(userId);
}

/** Ends every session of a user but one (a password change keeps the session that made it). */
export async function endOtherSessions(userId: string, keepSessionId: string | null): Promise<void> {
  if (!keepSessionId) return endAllSessions(userId);
  await db.delete(sessions).where(and(eq(sessions.userId, userId), ne(sessions.id, keepSessionId)));
}

/**
 * Test and seed helper: a new session for a user without going through cookies. Returns the
 * token, i.e. the cookie's value (validate it with validateSessionToken).
 */
export async function createSessionId(userId: string): Promise<string> {
  return newSession(userId);
}
