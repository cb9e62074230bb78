import "server-only";
import type { Tx } from "@/server/db/client";
import { auditLog } from "@/server/db/schema";
import type { SessionUser } from "@/server/auth/session";
import { currentTokenId } from "@/server/auth/route-scope";

export type AuditEntry = {
  campaignId?: string | null;
  action: string;
  entityType: string;
  entityId?: string | null;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
};

/** Appends to the audit log inside the caller's transaction, so the record and the change commit together. */
export async function audit(tx: Tx, actor: Pick<SessionUser, "id" | "email"> | null, e: AuditEntry): Promise<void> {
  await tx.insert(auditLog).values({
    actorId: actor?.id ?? null,
    actorEmail: actor?.email ?? null,
    campaignId: e.campaignId ?? null,
    action: e.action,
    entityType: e.entityType,
    entityId: e.entityId ?? null,
    before: e.before === undefined ? null : (e.before as object),
    after: e.after === undefined ? null : (e.after as object),
    reason: e.reason ?? null,
    // A change made through a personal API token names the token.
    tokenId: currentTokenId(),
  });
}
