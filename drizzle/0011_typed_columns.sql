ALTER TABLE "plate_maps" ADD CONSTRAINT "plate_maps_format" CHECK ("plate_maps"."format" in (96, 384, 1536));--> statement-breakpoint
ALTER TABLE "plate_runs" ADD CONSTRAINT "plate_runs_format" CHECK ("plate_runs"."format" in (96, 384, 1536));--> statement-breakpoint
ALTER TABLE "compound_results" ADD CONSTRAINT "compound_results_mechanism" CHECK ("compound_results"."mechanism" in ('competitive', 'uncompetitive', 'noncompetitive', 'mixed'));--> statement-breakpoint
ALTER TABLE "mechanism_overrides" ADD CONSTRAINT "mechanism_overrides_model" CHECK ("mechanism_overrides"."model" in ('competitive', 'uncompetitive', 'noncompetitive', 'mixed'));--> statement-breakpoint
ALTER TABLE "compound_imports" ADD CONSTRAINT "compound_imports_format" CHECK ("compound_imports"."format" in ('csv', 'xlsx', 'sdf'));--> statement-breakpoint
ALTER TABLE "hit_rows" ADD CONSTRAINT "hit_rows_mechanism" CHECK ("hit_rows"."mechanism" in ('competitive', 'uncompetitive', 'noncompetitive', 'mixed'));