CREATE TABLE "sketch_edits" (
	"id" text PRIMARY KEY NOT NULL,
	"sketch_id" text NOT NULL,
	"op_id" text NOT NULL,
	"revision" integer,
	"user_id" text,
	"op" jsonb NOT NULL,
	"status" text NOT NULL,
	"reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "socket_io_attachments" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"created_at" timestamp with time zone DEFAULT now(),
	"payload" "bytea"
);
--> statement-breakpoint
CREATE TABLE "walkthroughs" (
	"sketch_id" text PRIMARY KEY NOT NULL,
	"lead_user_id" text NOT NULL,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "sketch_edits" ADD CONSTRAINT "sketch_edits_sketch_id_sketches_id_fk" FOREIGN KEY ("sketch_id") REFERENCES "public"."sketches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sketch_edits" ADD CONSTRAINT "sketch_edits_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "walkthroughs" ADD CONSTRAINT "walkthroughs_sketch_id_sketches_id_fk" FOREIGN KEY ("sketch_id") REFERENCES "public"."sketches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "walkthroughs" ADD CONSTRAINT "walkthroughs_lead_user_id_users_id_fk" FOREIGN KEY ("lead_user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "sketch_edits_op_idx" ON "sketch_edits" USING btree ("sketch_id","op_id");--> statement-breakpoint
CREATE INDEX "sketch_edits_revision_idx" ON "sketch_edits" USING btree ("sketch_id","revision");