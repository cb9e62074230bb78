import { z } from "zod";
import { registerCompoundSchema } from "@/lib/chem/validation";
import { pageLimit, pageOffset } from "@/lib/validation/paging";

/** Body of POST /api/compounds: the register form's schema (src/lib/chem/validation.ts). */
export const registerBody = registerCompoundSchema;

const optionalNumber = z.preprocess((v) => (v === "" ? undefined : v), z.coerce.number().finite().optional());

/** Query of GET /api/compounds. */
export const searchQuery = z.object({
  q: z.string().trim().max(200, "q: at most 200 characters.").optional(),
  substructure: z.string().trim().max(500, "substructure: at most 500 characters.").optional(),
  limit: pageLimit,
  offset: pageOffset(1_000_000),
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
