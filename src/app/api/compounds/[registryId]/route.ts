import { requireRegistryReader } from "@/server/auth/compound-access";
import { json, route } from "@/server/http";
import { getCompound } from "@/server/services/compounds";
import { registryIdParam } from "./schema";

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
