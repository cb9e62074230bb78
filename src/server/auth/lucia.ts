import "server-only";
import { Lucia, TimeSpan } from "lucia";
import { DrizzlePostgreSQLAdapter } from "@lucia-auth/adapter-drizzle";
import { db } from "@/server/db/client";
import { sessions, users } from "@/server/db/schema";
import { env } from "@/env";
import type { GlobalRole } from "@/lib/roles";

// lucia v3 is no longer developed by its authors; it stays behind this module (and session.ts)
// so it can be replaced without touching pages, actions or route handlers.
const adapter = new DrizzlePostgreSQLAdapter(db, sessions, users);

export const lucia = new Lucia(adapter, {
  // 30-day sessions; lucia extends a session when it is used in its second half.
  sessionExpiresIn: new TimeSpan(30, "d"),
  sessionCookie: {
    name: "inhibitrack_session",
    expires: true,
    attributes: { secure: env.NODE_ENV === "production", sameSite: "lax" },
  },
  getUserAttributes: (a) => ({ email: a.email, name: a.name, globalRole: a.globalRole }),
});

declare module "lucia" {
  interface Register {
    Lucia: typeof lucia;
    DatabaseUserAttributes: { email: string; name: string; globalRole: GlobalRole };
  }
}
