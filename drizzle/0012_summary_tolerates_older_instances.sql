-- An instance of the version before 0011 keeps saving while the instances are upgraded one at a
-- time. It writes documents without the summary columns; 0011 refused those writes, so during
-- an upgrade its editors could not save. Now such a write is accepted and leaves the row's
-- summary tagged with an older revision: the team's list reads that row's document until the
-- next write of this version, or the next start's `backfillSketchSummaries`, fills the columns.
-- This version's own connections say that they write the summary (the session setting
-- `shockwright.writes_summary`, sent at connect by `openDatabase`, server/db/client.ts), and a
-- write of theirs without it is still refused: a writer that forgets fails in its first test.
-- A document changed without a new revision is refused whoever writes it.
CREATE OR REPLACE FUNCTION "sketches_summary_written"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF NEW."summary_revision" IS DISTINCT FROM NEW."revision"
     AND coalesce(current_setting('shockwright.writes_summary', true), '') = 'on' THEN
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
$$;
