import { z } from "zod";

/** Multipart fields of POST /api/campaigns/{campaignId}/plate-maps (the CSV comes as `file`). */
export const createPlateMapForm = z.object({
  name: z.string().trim().min(1, "Give the plate map a name.").max(120, "A plate map name has at most 120 characters."),
  format: z
    .enum(["96", "384", "1536"], { message: "format must be 96, 384 or 1536" })
    .transform((f) => Number(f) as 96 | 384 | 1536),
  template: z
    .enum(["0", "1", "true", "false"])
    .optional()
    .transform((v) => v === "1" || v === "true"),
  signalDirection: z.enum(["falls", "rises"], { message: 'signalDirection must be "falls" or "rises"' }).optional(),
  file: z.instanceof(File, { message: "file: attach the plate map as a CSV file" }),
});
