import { z } from "zod";
import { registryIds } from "../../schema";

/** Body of POST /api/libraries/{libraryId}/members: compounds to add (ones already in it are skipped). */
export const PostLibraryMembersBody = z.strictObject({
  registryIds: registryIds.min(1, "Give at least one registry ID."),
});

/** Answer of POST …/members: how many were added and how many were members already. */
export const PostLibraryMembersResponse = z.object({
  libraryId: z.string().uuid(),
  added: z.number().int(),
  already: z.number().int(),
});
