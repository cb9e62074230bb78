CREATE TYPE "public"."compound_import_mode" AS ENUM('all_or_nothing', 'valid_only');--> statement-breakpoint
CREATE TYPE "public"."compound_import_status" AS ENUM('stored', 'preparing', 'ready', 'failed', 'committing', 'committed');--> statement-breakpoint
CREATE SEQUENCE "public"."compound_number_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1;--> statement-breakpoint
CREATE TABLE "compound_batches" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"compound_id" uuid NOT NULL,
	"batch_number" integer NOT NULL,
	"supplier" text,
	"purity_pct" double precision,
	"amount" double precision,
	"amount_unit" text,
	"salt_form" text,
	"batch_date" date,
	"notes" text,
	"registered_by" text,
	"registered_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "compound_import_rows" (
	"import_id" uuid NOT NULL,
	"record_no" integer NOT NULL,
	"line" integer NOT NULL,
	"ok" boolean NOT NULL,
	"data" jsonb,
	"issues" jsonb,
	CONSTRAINT "compound_import_rows_import_id_record_no_pk" PRIMARY KEY("import_id","record_no")
);
--> statement-breakpoint
CREATE TABLE "compound_imports" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"file_name" text NOT NULL,
	"sha256" text NOT NULL,
	"s3_key" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"format" text NOT NULL,
	"status" "compound_import_status" DEFAULT 'stored' NOT NULL,
	"progress_done" integer DEFAULT 0 NOT NULL,
	"progress_total" integer DEFAULT 0 NOT NULL,
	"preview" jsonb,
	"mode" "compound_import_mode",
	"result" jsonb,
	"error" text,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"committed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "compound_libraries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"description" text,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "compounds" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"registry_id" text NOT NULL,
	"registry_number" integer NOT NULL,
	"name" text,
	"aliases" text[] DEFAULT '{}'::text[] NOT NULL,
	"structure_key" text NOT NULL,
	"flat_key" text NOT NULL,
	"canonical_smiles" text NOT NULL,
	"molfile" text,
	"formula" text NOT NULL,
	"mw_g_per_mol" double precision NOT NULL,
	"exact_mass_da" double precision NOT NULL,
	"heavy_atoms" integer NOT NULL,
	"clogp" double precision NOT NULL,
	"hbd" integer NOT NULL,
	"hba" integer NOT NULL,
	"tpsa_a2" double precision NOT NULL,
	"rotatable_bonds" integer NOT NULL,
	"fingerprint" bit(1024) NOT NULL,
	"distinct_reason" text,
	"registered_by" text,
	"registered_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "compound_library_members" (
	"library_id" uuid NOT NULL,
	"compound_id" uuid NOT NULL,
	"added_by" text,
	"added_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "compound_library_members_library_id_compound_id_pk" PRIMARY KEY("library_id","compound_id")
);
--> statement-breakpoint
CREATE TABLE "stock_solutions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"batch_id" uuid NOT NULL,
	"concentration_mm" double precision,
	"solvent" text,
	"volume_ul" double precision,
	"location" text,
	"made_on" date,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "compound_batches" ADD CONSTRAINT "compound_batches_compound_id_compounds_id_fk" FOREIGN KEY ("compound_id") REFERENCES "public"."compounds"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compound_batches" ADD CONSTRAINT "compound_batches_registered_by_users_id_fk" FOREIGN KEY ("registered_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compound_import_rows" ADD CONSTRAINT "compound_import_rows_import_id_compound_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."compound_imports"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compound_imports" ADD CONSTRAINT "compound_imports_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compound_libraries" ADD CONSTRAINT "compound_libraries_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compounds" ADD CONSTRAINT "compounds_registered_by_users_id_fk" FOREIGN KEY ("registered_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compound_library_members" ADD CONSTRAINT "compound_library_members_library_id_compound_libraries_id_fk" FOREIGN KEY ("library_id") REFERENCES "public"."compound_libraries"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compound_library_members" ADD CONSTRAINT "compound_library_members_compound_id_compounds_id_fk" FOREIGN KEY ("compound_id") REFERENCES "public"."compounds"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "compound_library_members" ADD CONSTRAINT "compound_library_members_added_by_users_id_fk" FOREIGN KEY ("added_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_solutions" ADD CONSTRAINT "stock_solutions_batch_id_compound_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."compound_batches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_solutions" ADD CONSTRAINT "stock_solutions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "compound_batches_number" ON "compound_batches" USING btree ("compound_id","batch_number");--> statement-breakpoint
CREATE INDEX "compound_imports_created" ON "compound_imports" USING btree ("created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "compound_libraries_name" ON "compound_libraries" USING btree (lower("name"));--> statement-breakpoint
CREATE UNIQUE INDEX "compounds_registry_id" ON "compounds" USING btree ("registry_id");--> statement-breakpoint
CREATE UNIQUE INDEX "compounds_registry_number" ON "compounds" USING btree ("registry_number");--> statement-breakpoint
CREATE UNIQUE INDEX "compounds_structure_key" ON "compounds" USING btree ("structure_key");--> statement-breakpoint
CREATE INDEX "compounds_flat_key" ON "compounds" USING btree ("flat_key");--> statement-breakpoint
CREATE INDEX "compounds_name_lower" ON "compounds" USING btree (lower("name"));--> statement-breakpoint
CREATE INDEX "compounds_aliases" ON "compounds" USING gin ("aliases");--> statement-breakpoint
CREATE INDEX "compound_library_members_compound" ON "compound_library_members" USING btree ("compound_id");--> statement-breakpoint
CREATE INDEX "stock_solutions_batch" ON "stock_solutions" USING btree ("batch_id");