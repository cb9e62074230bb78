import { requireCampaign } from "@/server/auth/guard";
import { route } from "@/server/http";
import { AppError } from "@/server/errors";
import { getRawFile } from "@/server/services/plates";
import { runParams } from "./schema";

export const dynamic = "force-dynamic";

/** The raw reader export as uploaded (members), after checking it against its SHA-256. */
export const GET = route<{ campaignId: string; runId: string }>(async (_req, params) => {
  await requireCampaign(params.campaignId, "campaign:read");
  const p = runParams.safeParse(params);
  if (!p.success) throw new AppError("not_found", "No such plate run in this campaign.");
  const f = await getRawFile(p.data.campaignId, p.data.runId);
  const ascii = f.fileName.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
  return new Response(Buffer.from(f.bytes), {
    status: 200,
    headers: {
      "content-type": f.contentType || "application/octet-stream",
      "content-disposition": `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(f.fileName)}`,
      "x-content-sha256": f.sha256,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
