ALTER TABLE "throttle" ADD COLUMN "last_at" timestamp with time zone DEFAULT now() NOT NULL;
--> statement-breakpoint
-- Session ids are now SHA-256 of the cookie's token; rows stored under the old scheme (id = token) can never match, so they are ended here.
DELETE FROM "sessions";
