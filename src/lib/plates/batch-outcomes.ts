/** What became of one file of a plate batch (`pending` until it is processed). */
export const BATCH_FILE_OUTCOMES = ["pending", "stored", "duplicate", "refused", "unmatched"] as const;
export type BatchFileOutcome = (typeof BATCH_FILE_OUTCOMES)[number];
