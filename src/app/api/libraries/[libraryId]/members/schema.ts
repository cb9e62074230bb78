import { z } from "zod";
import { registryIds } from "../../schema";

/** Body of POST /api/libraries/{libraryId}/members: compounds to add (ones already in it are skipped). */
export const PostLibraryMembersBody = z.strictObject({
  registryIds: registryIds.min(1, "Give at least one registry ID."),
});
