import { z } from "zod";
import { campaignSchema } from "@/lib/validation/auth";
import { knownTimeZone } from "./[campaignId]/digest/schema";

/**
 * Body of POST /api/campaigns: the new-campaign form's fields (src/lib/validation/auth.ts). Km in
 * `kmUnit` (nM, µM, mM), enzyme concentration in `enzymeConcUnit` (pM, nM, µM), Z′ between −1
 * and 1, CV in %; the time zone must be one the runtime knows.
 */
export const PostCampaignBody = campaignSchema.strict().extend({ timeZone: knownTimeZone.default("UTC") });

/** Answer of POST /api/campaigns (201). */
export const PostCampaignResponse = z.object({ id: z.string().uuid(), name: z.string(), targetEnzyme: z.string() });
