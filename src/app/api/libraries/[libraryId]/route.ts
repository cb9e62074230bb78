import { requireRegistryReader } from "@/server/auth/compound-access";
import { json, route } from "@/server/http";
import { getLibrary } from "@/server/services/compounds";

export const dynamic = "force-dynamic";

/** One library with the members the reader may see, in registry order. */
export const GET = route<{ libraryId: string }>(async (_req, { libraryId }) => {
  const scope = await requireRegistryReader();
  const lib = await getLibrary(scope, libraryId);
  return json({
    id: lib.id,
    name: lib.name,
    description: lib.description,
    createdAt: lib.createdAt.toISOString(),
    members: lib.members,
  });
});
