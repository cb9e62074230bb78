import { z } from "zod";
import { safeText, safeTextRequired } from "@/lib/chem/validation";
import { REGISTRY_ID_SHAPE } from "@/lib/registry-id";

/** At most this many registry IDs in one request (the library service's own cap). */
export const MAX_IDS_PER_REQUEST = 10_000;

const idShape = new RegExp(`^${REGISTRY_ID_SHAPE.source}$`);

/** A list of registry IDs; each is checked against the registry (all found, or nothing is written). */
export const registryIds = z
  .array(
    z
      .string()
      .trim()
      .max(40, "A registry ID is too long.")
      .regex(idShape, "Not a registry ID (it must look like INH-000123)."),
  )
  .max(MAX_IDS_PER_REQUEST, `At most ${MAX_IDS_PER_REQUEST.toLocaleString("en")} registry IDs per request.`);

/** Body of POST /api/libraries: a new library, optionally with its first members. */
export const PostLibraryBody = z.strictObject({
  name: safeTextRequired(120).refine((s) => s.trim().length > 0, "Give the library a name."),
  description: safeText(1000),
  registryIds: registryIds.optional(),
});

/** Answer of POST /api/libraries (201): `added` counts the members it was created with. */
export const PostLibraryResponse = z.object({ id: z.string().uuid(), name: z.string(), added: z.number().int() });
