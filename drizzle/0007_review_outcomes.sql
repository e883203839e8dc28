CREATE TYPE "public"."review_outcome" AS ENUM('approved', 'changes_requested', 'reset');--> statement-breakpoint
ALTER TYPE "public"."review_status" ADD VALUE 'changes_requested' BEFORE 'approved';--> statement-breakpoint
CREATE TABLE "review_outcomes" (
	"id" text PRIMARY KEY NOT NULL,
	"sketch_id" text NOT NULL,
	"outcome" "review_outcome" NOT NULL,
	"revision" integer NOT NULL,
	"actor_id" text,
	"actor_name" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "sketches" ADD COLUMN "approval_id" text;--> statement-breakpoint
ALTER TABLE "review_outcomes" ADD CONSTRAINT "review_outcomes_sketch_id_sketches_id_fk" FOREIGN KEY ("sketch_id") REFERENCES "public"."sketches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_outcomes" ADD CONSTRAINT "review_outcomes_actor_id_users_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "review_outcomes_sketch_idx" ON "review_outcomes" USING btree ("sketch_id","created_at");--> statement-breakpoint
ALTER TABLE "sketches" ADD CONSTRAINT "sketches_approval_id_review_outcomes_id_fk" FOREIGN KEY ("approval_id") REFERENCES "public"."review_outcomes"("id") ON DELETE set null ON UPDATE no action;
--> statement-breakpoint
-- Approvals given before an approval named its revision [A1]: rebuilt from the activity feed's
-- last "status → approved" event, at the revision the sketch had at that moment (the last edit
-- logged before it), so a sketch edited since reads "changed since approval".
INSERT INTO "review_outcomes" ("id", "sketch_id", "outcome", "revision", "actor_id", "actor_name", "note", "created_at")
SELECT 'outcome_' || translate(substr(md5(s."id" || ' approval before 0007'), 1, 20), '01', 'gh'), s."id", 'approved',
       coalesce((SELECT max(e."revision") FROM "sketch_edits" e WHERE e."sketch_id" = s."id" AND e."revision" IS NOT NULL AND e."created_at" <= ev."created_at"), 0),
       ev."actor_id", coalesce(u."name", 'someone'), '', ev."created_at"
  FROM "sketches" s
  JOIN LATERAL (SELECT x."actor_id", x."created_at" FROM "sketch_events" x
                 WHERE x."sketch_id" = s."id" AND x."kind" = 'status.changed' AND x."detail"->>'to' = 'approved'
                 ORDER BY x."created_at" DESC LIMIT 1) ev ON true
  LEFT JOIN "users" u ON u."id" = ev."actor_id"
 WHERE s."review_status" = 'approved';--> statement-breakpoint
UPDATE "sketches" s SET "approval_id" = o."id" FROM "review_outcomes" o WHERE o."sketch_id" = s."id" AND s."review_status" = 'approved';--> statement-breakpoint
-- An approval nobody can name a revision for is not one: back to "in review".
UPDATE "sketches" SET "review_status" = 'in_review' WHERE "review_status" = 'approved' AND "approval_id" IS NULL;
