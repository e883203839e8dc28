CREATE TABLE "studies" (
	"id" text PRIMARY KEY NOT NULL,
	"sketch_id" text NOT NULL,
	"name" text NOT NULL,
	"definition" jsonb NOT NULL,
	"results" jsonb NOT NULL,
	"revision" integer NOT NULL,
	"points" integer NOT NULL,
	"counts" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"elapsed_ms" integer,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "unit_system" text DEFAULT 'si' NOT NULL;--> statement-breakpoint
ALTER TABLE "studies" ADD CONSTRAINT "studies_sketch_id_sketches_id_fk" FOREIGN KEY ("sketch_id") REFERENCES "public"."sketches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "studies" ADD CONSTRAINT "studies_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "studies_sketch_idx" ON "studies" USING btree ("sketch_id","created_at");