CREATE TABLE "plate_batch_files" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"batch_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"file_name" text NOT NULL,
	"content_type" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"sha256" text NOT NULL,
	"s3_key" text NOT NULL,
	"barcode" text,
	"plate_map_id" uuid,
	"matched_by" text,
	"outcome" text DEFAULT 'pending' NOT NULL,
	"run_id" uuid,
	"existing_run_id" uuid,
	"message" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "plate_batch_files_outcome" CHECK ("plate_batch_files"."outcome" in ('pending', 'stored', 'duplicate', 'refused', 'unmatched'))
);
--> statement-breakpoint
CREATE TABLE "plate_batches" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"label" text NOT NULL,
	"file_count" integer NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "plate_batch_files" ADD CONSTRAINT "plate_batch_files_batch_id_plate_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."plate_batches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_batch_files" ADD CONSTRAINT "plate_batch_files_plate_map_id_plate_maps_id_fk" FOREIGN KEY ("plate_map_id") REFERENCES "public"."plate_maps"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_batch_files" ADD CONSTRAINT "plate_batch_files_run_id_plate_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."plate_runs"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_batch_files" ADD CONSTRAINT "plate_batch_files_existing_run_id_plate_runs_id_fk" FOREIGN KEY ("existing_run_id") REFERENCES "public"."plate_runs"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_batches" ADD CONSTRAINT "plate_batches_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_batches" ADD CONSTRAINT "plate_batches_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "plate_batch_files_batch" ON "plate_batch_files" USING btree ("batch_id","position");--> statement-breakpoint
CREATE INDEX "plate_batches_campaign_created" ON "plate_batches" USING btree ("campaign_id","created_at");