CREATE TABLE "sign_ups" (
	"id" text PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"team_name" text NOT NULL,
	"password_hash" text NOT NULL,
	"token_hash" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sign_ups_token_hash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE INDEX "sign_ups_email_idx" ON "sign_ups" USING btree ("email");