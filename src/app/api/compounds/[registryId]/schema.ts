import { z } from "zod";
import { REGISTRY_ID_SHAPE } from "@/lib/registry-id";
import { aliasesSchema, safeText } from "@/lib/chem/validation";

/** Path of GET /api/compounds/{registryId}. */
export const registryIdParam = z.object({
  registryId: z
    .string()
    .trim()
    .min(1)
    .max(40, "registryId is too long")
    .regex(new RegExp(`^${REGISTRY_ID_SHAPE.source}$`), "registryId must look like INH-000123"),
});

const smiles = z.string().trim().min(1, "smiles is empty.").max(2000, "SMILES is longer than 2000 characters.");
const molfile = z.string().min(1, "molfile is empty.").max(1_000_000, "Molfile is larger than 1,000,000 characters.");

/**
 * Body of PATCH /api/compounds/{registryId}: a new structure (`smiles` or `molfile`, with a
 * `reason`, audited with the old and new structure) and/or new names. Names replace the old ones.
 */
export const PatchCompoundBody = z
  .strictObject({
    smiles: smiles.optional(),
    molfile: molfile.optional(),
    reason: safeText(500),
    name: safeText(200),
    aliases: aliasesSchema,
  })
  .superRefine((v, ctx) => {
    if (v.smiles !== undefined && v.molfile !== undefined)
      ctx.addIssue({ code: "custom", path: ["smiles"], message: "Give either a SMILES or a molfile, not both." });
    const structure = v.smiles !== undefined || v.molfile !== undefined;
    if (structure && !v.reason?.trim())
      ctx.addIssue({ code: "custom", path: ["reason"], message: "A structure edit needs a reason (it is audited)." });
    if (!structure && v.name === undefined && v.aliases === undefined)
      ctx.addIssue({
        code: "custom",
        path: [],
        message: "Give a smiles or molfile (with a reason), a name or aliases.",
      });
  });
