import { requireCapabilityAnywhere, requireUser } from "@/server/auth/guard";
import { json, parseJson, route } from "@/server/http";
import { addToLibrary } from "@/server/services/compounds";
import { PostLibraryMembersBody, PostLibraryMembersResponse } from "./schema";
import type { z } from "zod";

export const dynamic = "force-dynamic";

/**
 * Adds compounds to a library by registry ID (chemists, admins; one transaction, audited). An ID
 * not in the registry refuses the whole request with 400 naming it; `already` counts the ones
 * that were members before.
 */
export const POST = route<{ libraryId: string }>(async (req, { libraryId }) => {
  await requireUser();
  const body = await parseJson(req, PostLibraryMembersBody);
  const user = await requireCapabilityAnywhere("compound:write");
  const r = await addToLibrary(user, libraryId, body.registryIds.join("\n"));
  return json({ libraryId, added: r.added, already: r.already } satisfies z.infer<typeof PostLibraryMembersResponse>);
});
