import { z } from "zod";
import { pageLimit, pageOffset } from "@/lib/validation/paging";

/**
 * Query of GET /api/audit: the admin audit page's filters — `campaignId`, `action` contains,
 * `actor` (e-mail) contains — and paging by `limit` (1–200, default 50) and `offset`.
 */
export const GetAuditQuery = z.strictObject({
  campaignId: z.string().uuid("campaignId must be a campaign id.").optional(),
  action: z.string().trim().max(60, "action: at most 60 characters.").optional(),
  actor: z.string().trim().max(120, "actor: at most 120 characters.").optional(),
  limit: pageLimit,
  offset: pageOffset(10_000_000, "offset is too large"),
});

/** Answer of GET /api/audit: a page of rows, newest first, and the count of all matching rows. */
export const GetAuditResponse = z.object({
  items: z.array(
    z.object({
      id: z.number().int(),
      at: z.string().datetime(),
      actorId: z.string().nullable(),
      actorEmail: z.string().nullable(),
      campaignId: z.string().uuid().nullable(),
      campaignName: z.string().nullable(),
      action: z.string(),
      entityType: z.string(),
      entityId: z.string().nullable(),
      before: z.unknown(),
      after: z.unknown(),
      reason: z.string().nullable(),
    }),
  ),
  total: z.number().int(),
  limit: z.number().int(),
  offset: z.number().int(),
});
