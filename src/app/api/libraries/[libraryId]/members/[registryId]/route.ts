import { requireCapabilityAnywhere } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { removeFromLibrary } from "@/server/services/compounds";
import { registryIdParam } from "@/app/api/compounds/[registryId]/schema";

export const dynamic = "force-dynamic";

/** Takes one compound out of a library (chemists, admins; audited). 404 when it is not in it. */
export const DELETE = route<{ libraryId: string; registryId: string }>(async (_req, params) => {
  const user = await requireCapabilityAnywhere("compound:write");
  const { registryId } = registryIdParam.parse({ registryId: params.registryId });
  await removeFromLibrary(user, params.libraryId, registryId);
  return json({ libraryId: params.libraryId, registryId: registryId.toUpperCase(), removed: true });
});
