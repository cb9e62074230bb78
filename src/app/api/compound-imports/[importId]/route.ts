import { requireUser } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { getImport, importView } from "@/server/services/compounds";
import { importIdParam } from "./schema";

export const dynamic = "force-dynamic";

/**
 * An import job: status, progress, preview (per-record issues) and, once committed, the outcome.
 * Only the uploader and administrators; 404 for anyone else.
 */
export const GET = route<{ importId: string }>(async (_req, params) => {
  const user = await requireUser();
  const { importId } = importIdParam.parse(params);
  return json(importView(await getImport(user, importId)));
});
