import "server-only";
import type { SessionUser } from "./session";

/** Who does a use case: the signed-in person (id for foreign keys, e-mail for the audit row). */
export type Actor = Pick<SessionUser, "id" | "email">;
