CREATE TABLE "hit_row_versions" (
	"campaign_id" uuid PRIMARY KEY NOT NULL,
	"version" bigint DEFAULT 0 NOT NULL
);
--> statement-breakpoint
ALTER TABLE "hit_row_versions" ADD CONSTRAINT "hit_row_versions_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "hit_rows_ki_desc" ON "hit_rows" USING btree ("campaign_id","ki_um" desc nulls last,"compound_id" desc);--> statement-breakpoint
CREATE INDEX "hit_rows_ic50_desc" ON "hit_rows" USING btree ("campaign_id","ic50_um" desc nulls last,"compound_id" desc);--> statement-breakpoint
CREATE INDEX "hit_rows_pct_desc" ON "hit_rows" USING btree ("campaign_id","pct_inhibition" desc nulls last,"compound_id" desc);--> statement-breakpoint
CREATE INDEX "hit_rows_le_desc" ON "hit_rows" USING btree ("campaign_id","le" desc nulls last,"compound_id" desc);--> statement-breakpoint
CREATE INDEX "hit_rows_lipe_desc" ON "hit_rows" USING btree ("campaign_id","lipe" desc nulls last,"compound_id" desc);--> statement-breakpoint
CREATE INDEX "hit_rows_mw_desc" ON "hit_rows" USING btree ("campaign_id","mw_g_per_mol" desc nulls last,"compound_id" desc);--> statement-breakpoint
CREATE INDEX "hit_rows_clogp_desc" ON "hit_rows" USING btree ("campaign_id","clogp" desc nulls last,"compound_id" desc);--> statement-breakpoint
CREATE INDEX "hit_rows_hill_desc" ON "hit_rows" USING btree ("campaign_id","hill" desc nulls last,"compound_id" desc);--> statement-breakpoint
CREATE INDEX "hit_rows_last_tested_desc" ON "hit_rows" USING btree ("campaign_id","last_tested_at" desc nulls last,"compound_id" desc);