CREATE TYPE "public"."qc_verdict" AS ENUM('pass', 'fail');--> statement-breakpoint
CREATE TYPE "public"."run_decision" AS ENUM('pending', 'accepted', 'rejected');--> statement-breakpoint
CREATE TYPE "public"."signal_direction" AS ENUM('falls', 'rises');--> statement-breakpoint
CREATE TYPE "public"."well_role" AS ENUM('sample', 'neutral', 'full', 'blank', 'empty');--> statement-breakpoint
CREATE TABLE "plate_maps" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"name" text NOT NULL,
	"format" integer NOT NULL,
	"is_template" boolean DEFAULT false NOT NULL,
	"signal_direction" "signal_direction" DEFAULT 'falls' NOT NULL,
	"wells" jsonb NOT NULL,
	"sample_wells" integer NOT NULL,
	"neutral_wells" integer NOT NULL,
	"full_wells" integer NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "plate_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"plate_map_id" uuid NOT NULL,
	"barcode" text,
	"file_name" text NOT NULL,
	"content_type" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"sha256" text NOT NULL,
	"s3_key" text NOT NULL,
	"shape" text NOT NULL,
	"format" integer NOT NULL,
	"reads" integer NOT NULL,
	"well_count" integer NOT NULL,
	"readout" text NOT NULL,
	"qc" jsonb NOT NULL,
	"z_prime" double precision,
	"qc_verdict" "qc_verdict" NOT NULL,
	"decision" "run_decision" DEFAULT 'pending' NOT NULL,
	"decision_reason" text,
	"decided_by" text,
	"decided_at" timestamp with time zone,
	"uploaded_by" text,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "plate_well_masks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"run_id" uuid NOT NULL,
	"well" text NOT NULL,
	"reason" text NOT NULL,
	"masked_by" text,
	"masked_at" timestamp with time zone DEFAULT now() NOT NULL,
	"unmasked_by" text,
	"unmasked_at" timestamp with time zone,
	"unmask_reason" text
);
--> statement-breakpoint
CREATE TABLE "well_readings" (
	"run_id" uuid NOT NULL,
	"well" text NOT NULL,
	"well_index" integer NOT NULL,
	"role" "well_role" NOT NULL,
	"compound_id" text,
	"concentration_um" double precision,
	"substrate_um" double precision,
	"replicate_group" text,
	"is_edge" boolean NOT NULL,
	"value" double precision,
	"rate_signal_per_s" double precision,
	"rate_r_squared" double precision,
	"rate_linear" boolean,
	"rate_progress" text,
	"rate_window_start_s" double precision,
	"rate_window_end_s" double precision,
	"series" jsonb,
	"signal" double precision,
	"inhibition_pct" double precision,
	"masked" boolean DEFAULT false NOT NULL,
	CONSTRAINT "well_readings_run_id_well_pk" PRIMARY KEY("run_id","well")
);
--> statement-breakpoint
ALTER TABLE "plate_maps" ADD CONSTRAINT "plate_maps_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_maps" ADD CONSTRAINT "plate_maps_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_maps" ADD CONSTRAINT "plate_maps_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_runs" ADD CONSTRAINT "plate_runs_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_runs" ADD CONSTRAINT "plate_runs_plate_map_id_plate_maps_id_fk" FOREIGN KEY ("plate_map_id") REFERENCES "public"."plate_maps"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_runs" ADD CONSTRAINT "plate_runs_decided_by_users_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_runs" ADD CONSTRAINT "plate_runs_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_well_masks" ADD CONSTRAINT "plate_well_masks_run_id_plate_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."plate_runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_well_masks" ADD CONSTRAINT "plate_well_masks_masked_by_users_id_fk" FOREIGN KEY ("masked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plate_well_masks" ADD CONSTRAINT "plate_well_masks_unmasked_by_users_id_fk" FOREIGN KEY ("unmasked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "well_readings" ADD CONSTRAINT "well_readings_run_id_plate_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."plate_runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "plate_maps_campaign_name" ON "plate_maps" USING btree ("campaign_id",lower("name"));--> statement-breakpoint
CREATE UNIQUE INDEX "plate_runs_campaign_sha256" ON "plate_runs" USING btree ("campaign_id","sha256");--> statement-breakpoint
CREATE INDEX "plate_runs_campaign_uploaded" ON "plate_runs" USING btree ("campaign_id","uploaded_at");--> statement-breakpoint
CREATE INDEX "plate_runs_campaign_decision" ON "plate_runs" USING btree ("campaign_id","decision");--> statement-breakpoint
CREATE INDEX "plate_runs_sha256" ON "plate_runs" USING btree ("sha256");--> statement-breakpoint
CREATE INDEX "plate_runs_plate_map" ON "plate_runs" USING btree ("plate_map_id");--> statement-breakpoint
CREATE UNIQUE INDEX "plate_well_masks_open" ON "plate_well_masks" USING btree ("run_id","well") WHERE "plate_well_masks"."unmasked_at" is null;--> statement-breakpoint
CREATE INDEX "plate_well_masks_run" ON "plate_well_masks" USING btree ("run_id");--> statement-breakpoint
CREATE INDEX "well_readings_compound" ON "well_readings" USING btree ("compound_id","run_id");