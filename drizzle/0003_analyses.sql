CREATE TYPE "public"."analysis_status" AS ENUM('queued', 'running', 'done', 'failed');--> statement-breakpoint
CREATE TYPE "public"."experiment_kind" AS ENUM('single-dose', 'dose-response', 'mechanism');--> statement-breakpoint
CREATE TABLE "analyses" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"experiment_id" uuid NOT NULL,
	"campaign_id" uuid NOT NULL,
	"status" "analysis_status" DEFAULT 'queued' NOT NULL,
	"progress" double precision DEFAULT 0 NOT NULL,
	"engine_version" text NOT NULL,
	"input_hash" text NOT NULL,
	"inputs" jsonb NOT NULL,
	"is_current" boolean DEFAULT false NOT NULL,
	"compounds" integer,
	"error" text,
	"requested_by" text,
	"requested_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "compound_results" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"analysis_id" uuid NOT NULL,
	"experiment_id" uuid NOT NULL,
	"campaign_id" uuid NOT NULL,
	"kind" "experiment_kind" NOT NULL,
	"compound_id" text NOT NULL,
	"n_points" integer NOT NULL,
	"pct_inhibition" double precision,
	"pct_inhibition_sd" double precision,
	"hit" boolean,
	"ic50_um" double precision,
	"ic50_lo_um" double precision,
	"ic50_hi_um" double precision,
	"ic50_qualifier" text,
	"hill" double precision,
	"mechanism" text,
	"mechanism_label" text,
	"ki_um" double precision,
	"ki_lo_um" double precision,
	"ki_hi_um" double precision,
	"kic_um" double precision,
	"kiu_um" double precision,
	"alpha" double precision,
	"flags" text[] DEFAULT '{}'::text[] NOT NULL,
	"detail" jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "experiment_runs" (
	"experiment_id" uuid NOT NULL,
	"run_id" uuid NOT NULL
);
--> statement-breakpoint
CREATE TABLE "experiments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"name" text NOT NULL,
	"kind" "experiment_kind" NOT NULL,
	"settings" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "mechanism_overrides" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"experiment_id" uuid NOT NULL,
	"compound_id" text NOT NULL,
	"model" text NOT NULL,
	"reason" text NOT NULL,
	"by" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "analyses" ADD CONSTRAINT "analyses_experiment_id_experiments_id_fk" FOREIGN KEY ("experiment_id") REFERENCES "public"."experiments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "analyses" ADD CONSTRAINT "analyses_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "analyses" ADD CONSTRAINT "analyses_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compound_results" ADD CONSTRAINT "compound_results_analysis_id_analyses_id_fk" FOREIGN KEY ("analysis_id") REFERENCES "public"."analyses"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compound_results" ADD CONSTRAINT "compound_results_experiment_id_experiments_id_fk" FOREIGN KEY ("experiment_id") REFERENCES "public"."experiments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compound_results" ADD CONSTRAINT "compound_results_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "experiment_runs" ADD CONSTRAINT "experiment_runs_experiment_id_experiments_id_fk" FOREIGN KEY ("experiment_id") REFERENCES "public"."experiments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "experiment_runs" ADD CONSTRAINT "experiment_runs_run_id_plate_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."plate_runs"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "experiments" ADD CONSTRAINT "experiments_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "experiments" ADD CONSTRAINT "experiments_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mechanism_overrides" ADD CONSTRAINT "mechanism_overrides_experiment_id_experiments_id_fk" FOREIGN KEY ("experiment_id") REFERENCES "public"."experiments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mechanism_overrides" ADD CONSTRAINT "mechanism_overrides_by_users_id_fk" FOREIGN KEY ("by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "analyses_experiment" ON "analyses" USING btree ("experiment_id","requested_at");--> statement-breakpoint
CREATE UNIQUE INDEX "analyses_one_current" ON "analyses" USING btree ("experiment_id") WHERE "analyses"."is_current";--> statement-breakpoint
CREATE INDEX "analyses_campaign_current" ON "analyses" USING btree ("campaign_id") WHERE "analyses"."is_current";--> statement-breakpoint
CREATE UNIQUE INDEX "compound_results_analysis_compound" ON "compound_results" USING btree ("analysis_id","compound_id");--> statement-breakpoint
CREATE INDEX "compound_results_campaign_compound" ON "compound_results" USING btree ("campaign_id","compound_id");--> statement-breakpoint
CREATE UNIQUE INDEX "experiment_runs_pk" ON "experiment_runs" USING btree ("experiment_id","run_id");--> statement-breakpoint
CREATE INDEX "experiment_runs_run" ON "experiment_runs" USING btree ("run_id");--> statement-breakpoint
CREATE INDEX "experiments_campaign" ON "experiments" USING btree ("campaign_id","created_at");--> statement-breakpoint
CREATE INDEX "mechanism_overrides_experiment" ON "mechanism_overrides" USING btree ("experiment_id","compound_id","at");