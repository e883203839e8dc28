-- Written by drizzle-kit, then completed by hand: every row is checked against its list before
-- the casts, so none can stop the upgrade with a bare cast error. Every word ever written by the
-- code is in the lists (the activity feed's legacy `status.changed` included); a solve status or
-- an edit outcome outside them is mapped, an audit action or an activity kind outside them stops
-- the upgrade naming the words found (nothing of the audit trail or the feed is dropped or
-- relabelled by guesswork). None of these columns has a default to drop around the cast.
CREATE TYPE "public"."analysis_status" AS ENUM('ok', 'detached', 'subsonic', 'vacuum', 'blunt', 'invalid');--> statement-breakpoint
CREATE TYPE "public"."audit_action" AS ENUM('team.created', 'member.invited', 'invitation.revoked', 'invitation.accepted', 'member.role_changed', 'member.removed', 'member.left');--> statement-breakpoint
CREATE TYPE "public"."edit_status" AS ENUM('applied', 'rebased', 'rejected');--> statement-breakpoint
CREATE TYPE "public"."sketch_event_kind" AS ENUM('pin.created', 'pin.replied', 'pin.resolved', 'pin.reopened', 'snapshot.created', 'snapshot.restored', 'section.imported', 'review.requested', 'review.approved', 'review.changes_requested', 'review.reset', 'status.changed');--> statement-breakpoint
DO $$
DECLARE
  found text;
BEGIN
  SELECT string_agg(DISTINCT quote_literal("action"), ', ') INTO found
    FROM "audit_events" WHERE "action" <> ALL (enum_range(NULL::"public"."audit_action")::text[]);
  IF found IS NOT NULL THEN
    RAISE EXCEPTION 'audit_events.action holds words outside AUDIT_ACTIONS (shared/model/teams.ts): %', found
      USING HINT = 'Add each word to the list (with its sentence on the members page) and generate the migration again, or change those rows; then start again.';
  END IF;
  SELECT string_agg(DISTINCT quote_literal("kind"), ', ') INTO found
    FROM "sketch_events" WHERE "kind" <> ALL (enum_range(NULL::"public"."sketch_event_kind")::text[]);
  IF found IS NOT NULL THEN
    RAISE EXCEPTION 'sketch_events.kind holds words outside SKETCH_EVENT_KINDS (shared/model/review.ts): %', found
      USING HINT = 'Add each word to the list (with its sentence in the activity feed) and generate the migration again, or change those rows; then start again.';
  END IF;
END $$;--> statement-breakpoint
-- A solve status outside the list reads as unknown (as before a first solve); the next solve sets it.
UPDATE "sketches" SET "last_solve_status" = NULL
 WHERE "last_solve_status" <> ALL (enum_range(NULL::"public"."analysis_status")::text[]);--> statement-breakpoint
-- An edit's outcome outside the list follows from its revision (null only when rejected).
UPDATE "sketch_edits" SET "status" = CASE WHEN "revision" IS NULL THEN 'rejected' ELSE 'applied' END
 WHERE "status" <> ALL (enum_range(NULL::"public"."edit_status")::text[]);--> statement-breakpoint
ALTER TABLE "audit_events" ALTER COLUMN "action" SET DATA TYPE "public"."audit_action" USING "action"::"public"."audit_action";--> statement-breakpoint
ALTER TABLE "sketch_edits" ALTER COLUMN "status" SET DATA TYPE "public"."edit_status" USING "status"::"public"."edit_status";--> statement-breakpoint
ALTER TABLE "sketch_events" ALTER COLUMN "kind" SET DATA TYPE "public"."sketch_event_kind" USING "kind"::"public"."sketch_event_kind";--> statement-breakpoint
ALTER TABLE "sketches" ALTER COLUMN "last_solve_status" SET DATA TYPE "public"."analysis_status" USING "last_solve_status"::"public"."analysis_status";
