ALTER TABLE "analytes" ADD COLUMN "tea_absolute" double precision;--> statement-breakpoint
ALTER TABLE "analytes" ADD COLUMN "plausible_low" double precision;--> statement-breakpoint
ALTER TABLE "analytes" ADD COLUMN "plausible_high" double precision;--> statement-breakpoint
ALTER TABLE "analytes" ADD COLUMN "plausibility_source" text;--> statement-breakpoint
ALTER TABLE "analytes" ADD COLUMN "allows_negative" boolean DEFAULT false NOT NULL;