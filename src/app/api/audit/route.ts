import { requireAdmin } from "@/server/auth/guard";
import { json, parseQuery, route } from "@/server/http";
import { auditEntries } from "@/server/services/campaigns";
import { GetAuditQuery, GetAuditResponse } from "./schema";
import type { z } from "zod";

export const dynamic = "force-dynamic";

/**
 * The audit log, newest first (administrators only): who did what, when, with the values before
 * and after and the reason. Filters and paging as on the admin audit page; `total` counts every
 * matching row.
 */
export const GET = route(async (req) => {
  await requireAdmin();
  const q = parseQuery(req, GetAuditQuery);
  const { items, total } = await auditEntries({
    campaignId: q.campaignId,
    action: q.action || undefined,
    actor: q.actor || undefined,
    limit: q.limit,
    offset: q.offset,
  });
  return json({
    items: items.map(({ log, campaignName }) => ({
      id: log.id,
      at: log.at.toISOString(),
      actorId: log.actorId,
      actorEmail: log.actorEmail,
      campaignId: log.campaignId,
      campaignName,
      action: log.action,
      entityType: log.entityType,
      entityId: log.entityId,
      before: log.before,
      after: log.after,
      reason: log.reason,
    })),
    total,
    limit: q.limit,
    offset: q.offset,
  } satisfies z.infer<typeof GetAuditResponse>);
});
