import { z } from "zod";
import { maskReason } from "../schema";

export { MasksResponse as DeleteMaskResponse } from "../schema";

/** Body of DELETE …/plate-runs/{runId}/masks/{well}: why the well counts again. */
export const DeleteMaskBody = z.strictObject({ reason: maskReason });
