import { AppError } from "@/server/errors";
import { looksLikeRegistryId } from "@/lib/registry-id";

export { triageSchema as patchBody, commentSchema as commentBody } from "@/lib/hits/query";

/** A registry ID from the path (the shape of src/lib/registry-id); anything else is simply not found. */
export function registryIdParam(raw: string): string {
  const id = decodeURIComponent(raw);
  if (id.length > 40 || !looksLikeRegistryId(id)) throw new AppError("not_found", "No such compound in this campaign.");
  return id;
}
