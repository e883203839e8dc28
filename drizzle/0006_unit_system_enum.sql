-- Written by drizzle-kit, then reordered by hand: the text default must go before the column
-- becomes an enum (PostgreSQL cannot cast the old default), and comes back as an enum value.
CREATE TYPE "public"."unit_system" AS ENUM('si', 'us');--> statement-breakpoint
ALTER TABLE "users" ALTER COLUMN "unit_system" DROP DEFAULT;--> statement-breakpoint
ALTER TABLE "users" ALTER COLUMN "unit_system" SET DATA TYPE "public"."unit_system" USING "unit_system"::"public"."unit_system";--> statement-breakpoint
ALTER TABLE "users" ALTER COLUMN "unit_system" SET DEFAULT 'si'::"public"."unit_system";
