import { z } from "zod";
import { plateMapWellSchema } from "@/lib/plates";

const positiveUm = (field: string) =>
  z
    .number({ message: `${field}: a positive number (µM).` })
    .finite()
    .positive(`${field}: a positive number (µM).`);

/**
 * Body of POST …/results/{registryId}/plan: the new plate map's name and format; the IC50 defaults
 * to the compound's current result, Km to the campaign's, the assay [S] to the experiment's.
 */
export const PostPlanBody = z.strictObject({
  name: z
    .string({ message: "name: give the plate map a name." })
    .trim()
    .min(1, "name: give the plate map a name.")
    .max(120, "name: a plate map name has at most 120 characters."),
  format: z
    .union([z.literal(96), z.literal(384), z.literal(1536)], { message: "format must be 96, 384 or 1536" })
    .default(384),
  ic50Um: positiveUm("ic50Um").optional(),
  kmUm: positiveUm("kmUm").optional(),
  assaySubstrateUm: positiveUm("assaySubstrateUm").optional(),
});

/** Answer (201): the plate map created and the plan behind its layout. */
export const PostPlanResponse = z.object({
  id: z.string().uuid(),
  format: z.union([z.literal(96), z.literal(384), z.literal(1536)]),
  ic50Um: z.number(),
  expectedKiUm: z.number(),
  substrateUm: z.array(z.number()),
  inhibitorUm: z.array(z.number()),
  replicates: z.number().int(),
  warnings: z.array(z.string()),
  wells: z.array(plateMapWellSchema),
});
