import "server-only";
/** A day's plates in one upload: create (store, match, one transaction), process each file, read, assign, accept all that pass. */
export { createBatch, batchKeyFor, type BatchUploadFile, type BatchUploadInput } from "./create";
export { processBatch, batchInFlight } from "./process";
export { getBatch, listBatches, runSignals, type BatchView, type BatchFileView } from "./read";
export { assignBatchFile } from "./assign";
export { acceptPassing } from "./accept";
export { MAX_BATCH_FILES, MAX_BATCH_INFLATED_BYTES, MAX_BATCH_RATIO } from "./zip";
