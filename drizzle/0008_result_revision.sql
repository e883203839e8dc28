ALTER TABLE "sketches" ADD COLUMN "result_revision" integer;--> statement-breakpoint
-- Results stored before this column were written in the same transaction as their document.
UPDATE "sketches" SET "result_revision" = "revision" WHERE "last_result" IS NOT NULL;
