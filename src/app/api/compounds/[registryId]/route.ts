import { requireCapabilityAnywhere, requireUser } from "@/server/auth/guard";
import { compoundScope, requireRegistryReader } from "@/server/auth/compound-access";
import { json, parseJson, route } from "@/server/http";
import { editCompound, getCompound } from "@/server/services/compounds";
import { PatchCompoundBody, registryIdParam } from "./schema";

export const dynamic = "force-dynamic";

/**
 * One compound with its batches, stock solutions and libraries: for chemists and admins any
 * compound, for others one that appears in a campaign of theirs; 404 otherwise.
 */
export const GET = route<{ registryId: string }>(async (_req, params) => {
  const scope = await requireRegistryReader();
  const { registryId } = registryIdParam.parse(params);
  return json(await getCompound(scope, registryId));
});

/**
 * Edits a compound's structure (SMILES or molfile, with a reason; the chemistry runs in the
 * worker pool) and/or its names, exactly as the compound page's form does. Audited with the
 * values before and after. 200 with the compound as GET gives it; 409 when the new structure is
 * registered under another ID.
 */
export const PATCH = route<{ registryId: string }>(async (req, params) => {
  await requireUser();
  const { registryId } = registryIdParam.parse(params);
  const body = await parseJson(req, PatchCompoundBody);
  const user = await requireCapabilityAnywhere("compound:write");
  await editCompound(user, registryId, body);
  return json(await getCompound(await compoundScope(user), registryId));
});
