import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, parseQuery, route } from "@/server/http";
import { HIT_UNITS, listHits, setTriageStatus } from "@/server/services/hits";
import { bulkBody, listQuery } from "./schema";

export const dynamic = "force-dynamic";

/**
 * The campaign's ranked hits, sorted, filtered and paged in Postgres (members):
 * `?sort=FIELD&dir=asc|desc&limit=&offset=&status=&mechanism=&flagged=&hit=&q=&owner=&<field>Min=&<field>Max=`
 * → `{ items, total, limit, offset, units }`. Concentrations in µM.
 */
export const GET = route<{ campaignId: string }>(async (req, { campaignId }) => {
  await requireCampaign(campaignId);
  const q = parseQuery(req, listQuery);
  const { items, total } = await listHits(campaignId, q, q.limit, q.offset);
  return json({ items, total, limit: q.limit, offset: q.offset, units: HIT_UNITS });
});

/** Sets the triage status of a selection in one transaction (leads, admins): `{ registryIds, status, comment? }`. */
export const PATCH = route<{ campaignId: string }>(async (req, { campaignId }) => {
  const { user } = await requireCampaign(campaignId, "triage:write");
  const body = await parseJson(req, bulkBody);
  return json(await setTriageStatus(user, campaignId, body.registryIds, body.status, body.comment));
});
