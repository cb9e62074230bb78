import { requireCapabilityAnywhere, requireUser } from "@/server/auth/guard";
import { requireRegistryReader } from "@/server/auth/compound-access";
import { json, parseJson, route } from "@/server/http";
import { createLibrary, listLibraries } from "@/server/services/compounds";
import { PostLibraryBody, PostLibraryResponse } from "./schema";
import type { z } from "zod";

export const dynamic = "force-dynamic";

/** Every library, with the number of its members the reader may see. */
export const GET = route(async () => {
  const scope = await requireRegistryReader();
  const items = await listLibraries(scope);
  return json({ items: items.map((l) => ({ ...l, createdAt: l.createdAt.toISOString() })) });
});

/** Creates a library (chemists, admins; audited), with members when `registryIds` is given (all found or nothing). */
export const POST = route(async (req) => {
  await requireUser();
  const body = await parseJson(req, PostLibraryBody);
  const user = await requireCapabilityAnywhere("compound:write");
  const { id, added } = await createLibrary(user, {
    name: body.name,
    description: body.description,
    ids: body.registryIds?.join("\n"),
  });
  return json({ id, name: body.name, added } satisfies z.infer<typeof PostLibraryResponse>, 201);
});
