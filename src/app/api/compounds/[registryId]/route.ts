import { requireUser } from "@/server/auth/guard";
import { json, route } from "@/server/http";
import { getCompound } from "@/server/services/compounds";
import { registryIdParam } from "./schema";

export const dynamic = "force-dynamic";

/** One compound with its batches, stock solutions and libraries (anyone signed in). */
export const GET = route<{ registryId: string }>(async (_req, params) => {
  await requireUser();
  const { registryId } = registryIdParam.parse(params);
  return json(await getCompound(registryId));
});
