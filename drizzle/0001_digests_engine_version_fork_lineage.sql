ALTER TABLE "sheet_versions" ADD COLUMN "engine_version" integer;--> statement-breakpoint
ALTER TABLE "sheets" ADD COLUMN "forked_from_version" integer;--> statement-breakpoint
-- Every digest saved before this migration was made by engine version 1 (shared/engine/version.ts).
UPDATE "sheet_versions" SET "engine_version" = 1 WHERE "digests" <> '{}'::jsonb;--> statement-breakpoint
ALTER TABLE "sheet_versions" ADD CONSTRAINT "sheet_versions_digests_engine_version" CHECK (("sheet_versions"."digests" = '{}'::jsonb) = ("sheet_versions"."engine_version" is null));