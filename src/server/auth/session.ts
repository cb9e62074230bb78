import "server-only";
import { cache } from "react";
import { cookies } from "next/headers";
import { lucia } from "./lucia";
import type { GlobalRole } from "@/lib/roles";

export type SessionUser = { id: string; email: string; name: string; globalRole: GlobalRole };
export type CurrentSession = { user: SessionUser; sessionId: string } | { user: null; sessionId: null };

export const SESSION_COOKIE = lucia.sessionCookieName;

/** The signed-in user of this request, validated once per request. */
export const getCurrentSession = cache(async (): Promise<CurrentSession> => {
  const jar = await cookies();
  const id = jar.get(lucia.sessionCookieName)?.value ?? null;
  if (!id) return { user: null, sessionId: null };
  const { session, user } = await lucia.validateSession(id);
  try {
    // Renew on use; Server Components cannot set cookies, so this only succeeds in actions
    // and route handlers (the proxy extends the cookie on page loads).
    if (session?.fresh) {
      const c = lucia.createSessionCookie(session.id);
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

export async function startSession(userId: string): Promise<void> {
  const session = await lucia.createSession(userId, {});
  const c = lucia.createSessionCookie(session.id);
  (await cookies()).set(c.name, c.value, c.attributes);
}

export async function endCurrentSession(): Promise<void> {
  const { sessionId } = await getCurrentSession();
  if (sessionId) await lucia.invalidateSession(sessionId);
  const c = lucia.createBlankSessionCookie();
  (await cookies()).set(c.name, c.value, c.attributes);
}

/** Ends every session of a user (password change, removal from a team). */
export async function endAllSessions(userId: string): Promise<void> {
  await lucia.invalidateUserSessions(userId);
}

/** Test and seed helper: a session id for a user without going through cookies. */
export async function createSessionId(userId: string): Promise<string> {
  return (await lucia.createSession(userId, {})).id;
}
