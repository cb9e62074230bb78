import { AppError } from "@/server/errors";

export { triageSchema as patchBody, commentSchema as commentBody } from "@/lib/hits/query";

/** A registry ID from the path; anything else is simply not found. */
export function registryIdParam(raw: string): string {
  const id = decodeURIComponent(raw);
  if (!/^[A-Za-z0-9._-]{1,40}$/.test(id)) throw new AppError("not_found", "No such compound in this campaign.");
  return id;
}
