CREATE TYPE "public"."triage_status" AS ENUM('unreviewed', 'confirmed', 'advance', 'on-hold', 'dropped');--> statement-breakpoint
CREATE TABLE "hit_comments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"compound_id" text NOT NULL,
	"body" text NOT NULL,
	"by" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "hit_rows" (
	"campaign_id" uuid NOT NULL,
	"compound_id" text NOT NULL,
	"name" text,
	"structure_key" text,
	"pct_inhibition" double precision,
	"hit" boolean,
	"ic50_um" double precision,
	"ic50_lo_um" double precision,
	"ic50_hi_um" double precision,
	"ic50_qualifier" text,
	"hill" double precision,
	"mechanism" text,
	"mechanism_label" text,
	"mechanism_overridden" boolean DEFAULT false NOT NULL,
	"ki_um" double precision,
	"ki_lo_um" double precision,
	"ki_hi_um" double precision,
	"kic_um" double precision,
	"kiu_um" double precision,
	"alpha" double precision,
	"flags" text[] DEFAULT '{}'::text[] NOT NULL,
	"flagged" boolean DEFAULT false NOT NULL,
	"p_ki" double precision,
	"le" double precision,
	"lipe" double precision,
	"mw_g_per_mol" double precision,
	"clogp" double precision,
	"heavy_atoms" integer,
	"status" "triage_status" DEFAULT 'unreviewed' NOT NULL,
	"owner_id" text,
	"owner_name" text,
	"status_changed_at" timestamp with time zone,
	"last_tested_at" timestamp with time zone,
	"comment_count" integer DEFAULT 0 NOT NULL,
	"first_seen_at" timestamp with time zone DEFAULT now() NOT NULL,
	"ki_first_at" timestamp with time zone,
	"refreshed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "hit_rows_campaign_id_compound_id_pk" PRIMARY KEY("campaign_id","compound_id")
);
--> statement-breakpoint
CREATE TABLE "hit_views" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" text NOT NULL,
	"campaign_id" uuid NOT NULL,
	"name" text NOT NULL,
	"state" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "triage_decisions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"compound_id" text NOT NULL,
	"from_status" "triage_status" NOT NULL,
	"to_status" "triage_status" NOT NULL,
	"comment" text,
	"by" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "hit_comments" ADD CONSTRAINT "hit_comments_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit_comments" ADD CONSTRAINT "hit_comments_by_users_id_fk" FOREIGN KEY ("by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit_rows" ADD CONSTRAINT "hit_rows_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit_rows" ADD CONSTRAINT "hit_rows_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit_views" ADD CONSTRAINT "hit_views_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit_views" ADD CONSTRAINT "hit_views_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "triage_decisions" ADD CONSTRAINT "triage_decisions_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "triage_decisions" ADD CONSTRAINT "triage_decisions_by_users_id_fk" FOREIGN KEY ("by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "hit_comments_compound" ON "hit_comments" USING btree ("campaign_id","compound_id","at");--> statement-breakpoint
CREATE INDEX "hit_rows_ranked" ON "hit_rows" USING btree ("campaign_id","flagged","ki_um" asc nulls last,"ic50_um" asc nulls last,"pct_inhibition" desc nulls last,"compound_id");--> statement-breakpoint
CREATE INDEX "hit_rows_status" ON "hit_rows" USING btree ("campaign_id","status","compound_id");--> statement-breakpoint
CREATE INDEX "hit_rows_mechanism" ON "hit_rows" USING btree ("campaign_id","mechanism");--> statement-breakpoint
CREATE INDEX "hit_rows_ki" ON "hit_rows" USING btree ("campaign_id","ki_um","compound_id");--> statement-breakpoint
CREATE INDEX "hit_rows_ic50" ON "hit_rows" USING btree ("campaign_id","ic50_um","compound_id");--> statement-breakpoint
CREATE INDEX "hit_rows_pct" ON "hit_rows" USING btree ("campaign_id","pct_inhibition","compound_id");--> statement-breakpoint
CREATE INDEX "hit_rows_le" ON "hit_rows" USING btree ("campaign_id","le","compound_id");--> statement-breakpoint
CREATE INDEX "hit_rows_lipe" ON "hit_rows" USING btree ("campaign_id","lipe","compound_id");--> statement-breakpoint
CREATE INDEX "hit_rows_mw" ON "hit_rows" USING btree ("campaign_id","mw_g_per_mol","compound_id");--> statement-breakpoint
CREATE INDEX "hit_rows_clogp" ON "hit_rows" USING btree ("campaign_id","clogp","compound_id");--> statement-breakpoint
CREATE INDEX "hit_rows_hill" ON "hit_rows" USING btree ("campaign_id","hill","compound_id");--> statement-breakpoint
CREATE INDEX "hit_rows_last_tested" ON "hit_rows" USING btree ("campaign_id","last_tested_at","compound_id");--> statement-breakpoint
CREATE UNIQUE INDEX "hit_views_name" ON "hit_views" USING btree ("user_id","campaign_id",lower("name"));--> statement-breakpoint
CREATE INDEX "triage_decisions_compound" ON "triage_decisions" USING btree ("campaign_id","compound_id","at");--> statement-breakpoint
CREATE INDEX "triage_decisions_campaign_at" ON "triage_decisions" USING btree ("campaign_id","at");