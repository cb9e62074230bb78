import { z } from "zod";
import { PLATE_FORMATS } from "@/lib/plates/geometry";
import { plateMapWellSchema } from "@/lib/plates";
import { SIGNAL_DIRECTIONS } from "@/lib/plates/run-qc";

const name = z
  .string()
  .trim()
  .min(1, "name: give the plate map a name.")
  .max(120, "name: a plate map name has at most 120 characters.");

/**
 * Body of PATCH …/plate-maps/{plateMapId}: any of the fields; `wells` (the wells that are not
 * empty) replaces the whole layout, in the map's own format. A map that runs use cannot change (409).
 */
export const PatchPlateMapBody = z
  .strictObject({
    name: name.optional(),
    template: z.boolean().optional(),
    signalDirection: z.enum(SIGNAL_DIRECTIONS, { message: 'signalDirection must be "falls" or "rises"' }).optional(),
    wells: z.array(plateMapWellSchema).max(1536, "wells: at most 1536 wells.").optional(),
  })
  .refine((b) => Object.keys(b).length > 0, {
    message: "Nothing to change: give name, template, signalDirection or wells.",
  });

/** Body of POST …/plate-maps/{plateMapId}/copy: the copy's name (the copy is a template). */
export const PostPlateMapCopyBody = z.strictObject({ name });

/** One plate map: its settings, role counts, the wells that are not empty, and how many runs use it. */
export const GetPlateMapResponse = z.object({
  id: z.string().uuid(),
  name: z.string(),
  format: z.union(PLATE_FORMATS.map((f) => z.literal(f)) as [z.ZodLiteral<96>, z.ZodLiteral<384>, z.ZodLiteral<1536>]),
  isTemplate: z.boolean(),
  signalDirection: z.enum(SIGNAL_DIRECTIONS),
  sampleWells: z.number().int(),
  neutralWells: z.number().int(),
  fullWells: z.number().int(),
  runs: z.number().int(),
  updatedAt: z.string(),
  wells: z.array(plateMapWellSchema),
});
