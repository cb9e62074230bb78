import { z } from "zod";
import { registerCompoundSchema } from "@/lib/chem/validation";

/** Body of POST /api/compounds: the register form's schema (src/lib/chem/validation.ts). */
export const registerBody = registerCompoundSchema;

const optionalNumber = z.preprocess((v) => (v === "" ? undefined : v), z.coerce.number().finite().optional());

/** Query of GET /api/compounds. */
export const searchQuery = z.object({
  q: z.string().trim().max(200, "q: at most 200 characters.").optional(),
  substructure: z.string().trim().max(500, "substructure: at most 500 characters.").optional(),
  limit: z.coerce
    .number()
    .int("limit must be a whole number")
    .min(1, "limit must be 1–200")
    .max(200, "limit must be 1–200")
    .default(50),
  offset: z.coerce
    .number()
    .int("offset must be a whole number")
    .min(0, "offset must be 0 or more")
    .max(1_000_000)
    .default(0),
  sort: z
    .enum(["registryId", "name", "mw", "clogp", "heavyAtoms", "tpsa", "registeredAt"], {
      error: "sort must be one of registryId, name, mw, clogp, heavyAtoms, tpsa, registeredAt",
    })
    .optional(),
  dir: z.enum(["asc", "desc"], { error: "dir must be asc or desc" }).optional(),
  library: z.string().uuid("library must be a library id").optional(),
  mwMin: optionalNumber,
  mwMax: optionalNumber,
  thumbnails: z.enum(["0", "1"]).optional(),
});
