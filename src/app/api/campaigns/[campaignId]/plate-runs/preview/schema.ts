import { z } from "zod";

/** Multipart fields of POST /api/campaigns/{campaignId}/plate-runs/preview (nothing is stored). */
export const uploadRunForm = z.object({
  plateMapId: z.string().uuid("plateMapId must be a plate map id"),
  barcode: z.string().trim().max(64, "A barcode has at most 64 characters.").optional(),
  file: z.instanceof(File, { message: "file: attach the reader export (CSV, TSV or XLSX)" }),
});
