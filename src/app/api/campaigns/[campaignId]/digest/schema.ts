import { z } from "zod";

export const postBody = z.object({ preview: z.boolean().optional() }).strict();
