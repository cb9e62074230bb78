import { requireUser } from "@/server/auth/guard";
import { route } from "@/server/http";
import { getImport, importReportCsv } from "@/server/services/compounds";
import { importIdParam } from "./schema";

export const dynamic = "force-dynamic";

/** The import report as CSV: each record registered (registry ID) or not (field, reason). Uploader and admins only (404 otherwise). */
export const GET = route<{ importId: string }>(async (_req, params) => {
  const user = await requireUser();
  const { importId } = importIdParam.parse(params);
  const job = await getImport(user, importId);
  const base =
    job.fileName
      .replace(/\.[^.]+$/, "")
      .replace(/[^A-Za-z0-9._-]+/g, "_")
      .slice(0, 80) || "import";
  return new Response(importReportCsv(job), {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${base}-report.csv"`,
      "cache-control": "no-store",
    },
  });
});
