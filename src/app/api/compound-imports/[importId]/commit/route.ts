import { requireCapabilityAnywhere } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { commitImport, getImport, importView } from "@/server/services/compounds";
import { importIdParam } from "../schema";
import { commitBody } from "./schema";

export const dynamic = "force-dynamic";

/**
 * Register a prepared import in one transaction (its uploader while a chemist, and admins; 404
 * for anyone else). all_or_nothing: 400 and
 * nothing written when any record has a problem; valid_only: the valid records are registered.
 */
export const POST = route<{ importId: string }>(async (req, params) => {
  const user = await requireCapabilityAnywhere("compound:write");
  const { importId } = importIdParam.parse(params);
  const { mode } = await parseJson(req, commitBody);
  await commitImport(user, importId, mode);
  return json(importView(await getImport(user, importId)));
});
