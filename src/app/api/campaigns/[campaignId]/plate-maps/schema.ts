import { z } from "zod";
import { PLATE_FORMATS } from "@/lib/plates/geometry";
import { SIGNAL_DIRECTIONS } from "@/lib/plates/run-qc";

const FORMAT_MESSAGE = `format must be ${PLATE_FORMATS.slice(0, -1).join(", ")} or ${PLATE_FORMATS.at(-1)}`;

/** Multipart fields of POST /api/campaigns/{campaignId}/plate-maps (the CSV comes as `file`). */
export const createPlateMapForm = z.object({
  name: z.string().trim().min(1, "Give the plate map a name.").max(120, "A plate map name has at most 120 characters."),
  format: z.string({ error: () => FORMAT_MESSAGE }).transform((f, ctx) => {
    const format = PLATE_FORMATS.find((p) => String(p) === f);
    if (format === undefined) ctx.addIssue({ code: "custom", message: FORMAT_MESSAGE });
    return format ?? z.NEVER;
  }),
  template: z
    .enum(["0", "1", "true", "false"])
    .optional()
    .transform((v) => v === "1" || v === "true"),
  signalDirection: z.enum(SIGNAL_DIRECTIONS, { message: 'signalDirection must be "falls" or "rises"' }).optional(),
  file: z.instanceof(File, { message: "file: attach the plate map as a CSV file" }),
});
