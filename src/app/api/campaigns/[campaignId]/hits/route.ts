import { requireCampaign } from "@/server/auth/guard";
import { json, parseJson, parseQuery, route } from "@/server/http";
import { HIT_UNITS, listHitsJson, setTriageStatus } from "@/server/services/hits";
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
  // The items arrive as JSON text from Postgres and are passed through as they are.
  const { itemsJson, total } = await listHitsJson(campaignId, q, q.limit, q.offset);
  const body = `{"items":${itemsJson},"total":${total},"limit":${q.limit},"offset":${q.offset},"units":${JSON.stringify(HIT_UNITS)}}`;
  return new Response(body, { headers: { "content-type": "application/json" } });
});

/** Sets the triage status of a selection in one transaction (leads, admins): `{ registryIds, status, comment? }`. */
export const PATCH = route<{ campaignId: string }>(async (req, { campaignId }) => {
  const { user } = await requireCampaign(campaignId, "triage:write");
  const body = await parseJson(req, bulkBody);
  return json(await setTriageStatus(user, campaignId, body.registryIds, body.status, body.comment));
});
