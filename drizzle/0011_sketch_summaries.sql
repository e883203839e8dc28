ALTER TABLE "sketches" ADD COLUMN "vertex_count" integer;--> statement-breakpoint
ALTER TABLE "sketches" ADD COLUMN "thickness_ratio" double precision;--> statement-breakpoint
ALTER TABLE "sketches" ADD COLUMN "selected_mach" double precision;--> statement-breakpoint
ALTER TABLE "sketches" ADD COLUMN "selected_alpha_deg" double precision;--> statement-breakpoint
ALTER TABLE "sketches" ADD COLUMN "design_point_count" integer;--> statement-breakpoint
ALTER TABLE "sketches" ADD COLUMN "selected_point_name" text;--> statement-breakpoint
ALTER TABLE "sketches" ADD COLUMN "summary_revision" integer;--> statement-breakpoint
ALTER TABLE "sketches" ADD CONSTRAINT "sketches_summary_whole" CHECK ("sketches"."summary_revision" is null or ("sketches"."vertex_count" is not null and "sketches"."selected_mach" is not null and "sketches"."selected_alpha_deg" is not null and "sketches"."design_point_count" is not null and "sketches"."selected_point_name" is not null));--> statement-breakpoint
-- Every writer of a sketch's document (or revision) writes the summary of that document in the
-- same statement, computed at the revision it writes (server/db/sketchSummary.ts
-- `sketchSummaryColumns`). A writer that forgets is refused here, in whichever test first runs
-- it, instead of leaving the home table showing an older section. A document changes only with a
-- new revision (revisions name one document each), so a summary tagged with the revision is the
-- summary of the document. Rows stored before this migration keep a null summary until
-- `backfillSketchSummaries` (run with the migrations) fills it.
CREATE FUNCTION "sketches_summary_written"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF NEW."summary_revision" IS DISTINCT FROM NEW."revision" THEN
    RAISE EXCEPTION 'sketch % written at revision % with the summary of revision %: write the summary columns with the document (sketchSummaryColumns)',
      NEW."id", NEW."revision", coalesce(NEW."summary_revision"::text, 'none');
  END IF;
  IF TG_OP = 'UPDATE' AND NEW."revision" = OLD."revision" THEN
    IF NEW."document" IS DISTINCT FROM OLD."document" THEN
      RAISE EXCEPTION 'sketch %: its document changed without a new revision (still %)', NEW."id", NEW."revision";
    END IF;
  END IF;
  RETURN NEW;
END
$$;--> statement-breakpoint
CREATE TRIGGER "sketches_summary_written" BEFORE INSERT OR UPDATE OF "document", "revision" ON "sketches"
  FOR EACH ROW EXECUTE FUNCTION "sketches_summary_written"();
