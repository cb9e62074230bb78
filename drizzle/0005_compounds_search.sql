-- Search by name and alias: trigram similarity (pg_trgm ships with Debian's PostgreSQL contrib;
-- trusted since PostgreSQL 13, so the database owner may create it).
CREATE EXTENSION IF NOT EXISTS pg_trgm;
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "compounds_name_trgm" ON "compounds" USING gin (lower("name") gin_trgm_ops);
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "compounds_registry_id_prefix" ON "compounds" ("registry_id" text_pattern_ops);
