import { pgTable, text, timestamp, uuid, integer, index, bigint, check } from "drizzle-orm/pg-core";
import { users, campaigns } from "./auth";
import { oneOf } from "./checks";
import { plateMaps, plateRuns } from "./plates";
import { BATCH_FILE_OUTCOMES, type BatchFileOutcome } from "@/lib/plates/batch-outcomes";

/**
 * A day's plates uploaded together. The batch row and all its file rows are written in one
 * transaction (every file `pending`) after every file's bytes are stored and checksummed; each
 * file then moves on to its outcome in its own transaction, so a crash mid-batch leaves the
 * files done so far with their outcomes and the rest visibly `pending`.
 */
export const plateBatches = pgTable(
  "plate_batches",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    campaignId: uuid("campaign_id")
      .notNull()
      .references(() => campaigns.id, { onDelete: "cascade" }),
    /** the zip's name, or "N files" */
    label: text("label").notNull(),
    fileCount: integer("file_count").notNull(),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
  },
  (t) => [index("plate_batches_campaign_created").on(t.campaignId, t.createdAt)],
);

/** One file of a batch: its bytes in the object store by SHA-256, and what became of it. */
export const plateBatchFiles = pgTable(
  "plate_batch_files",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    batchId: uuid("batch_id")
      .notNull()
      .references(() => plateBatches.id, { onDelete: "cascade" }),
    position: integer("position").notNull(),
    fileName: text("file_name").notNull(),
    contentType: text("content_type").notNull(),
    sizeBytes: bigint("size_bytes", { mode: "number" }).notNull(),
    sha256: text("sha256").notNull(),
    s3Key: text("s3_key").notNull(),
    barcode: text("barcode"),
    plateMapId: uuid("plate_map_id").references(() => plateMaps.id, { onDelete: "set null" }),
    /** how the plate map was chosen: manifest, file name, header, default, person */
    matchedBy: text("matched_by"),
    outcome: text("outcome").$type<BatchFileOutcome>().notNull().default("pending"),
    runId: uuid("run_id").references(() => plateRuns.id, { onDelete: "set null" }),
    /** for `duplicate`: the run the same bytes were uploaded as before */
    existingRunId: uuid("existing_run_id").references(() => plateRuns.id, { onDelete: "set null" }),
    message: text("message"),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("plate_batch_files_batch").on(t.batchId, t.position),
    check("plate_batch_files_outcome", oneOf(t.outcome, BATCH_FILE_OUTCOMES)),
  ],
);
