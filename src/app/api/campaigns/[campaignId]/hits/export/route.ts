import { requireCampaign } from "@/server/auth/guard";
import { parseQuery, route } from "@/server/http";
import { exportHits, hitsCsv, hitsXlsx } from "@/server/services/hits";
import { exportQuery } from "./schema";

export const dynamic = "force-dynamic";

/** The current view (same sort and filters as GET …/hits) as XLSX or CSV (members). */
export const GET = route<{ campaignId: string }>(async (req, { campaignId }) => {
  const { campaign, user } = await requireCampaign(campaignId);
  const q = parseQuery(req, exportQuery);
  const { items, truncated } = await exportHits(campaignId, q);
  const stamp = new Date().toISOString().slice(0, 10);
  const base = `hits-${
    campaign.name
      .replace(/[^A-Za-z0-9]+/g, "-")
      .replace(/^-|-$/g, "")
      .slice(0, 40) || "campaign"
  }-${stamp}`;
  const headers: Record<string, string> = {
    "x-rows": String(items.length),
    "x-truncated": truncated ? "1" : "0",
    "cache-control": "no-store",
  };
  if (q.format === "csv") {
    return new Response(hitsCsv(items), {
      headers: {
        ...headers,
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="${base}.csv"`,
      },
    });
  }
  const query = new URL(req.url).searchParams;
  query.delete("format");
  const buf = await hitsXlsx(items, {
    campaignName: campaign.name,
    query: query.toString(),
    truncated,
    exportedBy: user.email,
  });
  return new Response(new Uint8Array(buf), {
    headers: {
      ...headers,
      "content-type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
      "content-disposition": `attachment; filename="${base}.xlsx"`,
    },
  });
});
