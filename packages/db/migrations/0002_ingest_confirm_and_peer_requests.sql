CREATE TABLE "peer_statistics_requests" (
	"control_lot_id" uuid NOT NULL,
	"analyte_id" uuid NOT NULL,
	"level" integer NOT NULL,
	"period" text NOT NULL,
	"requested_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "peer_statistics_requests_control_lot_id_analyte_id_level_period_pk" PRIMARY KEY("control_lot_id","analyte_id","level","period")
);
--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "confirmed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "confirmed_by" uuid;--> statement-breakpoint
ALTER TABLE "peer_statistics_requests" ADD CONSTRAINT "peer_statistics_requests_control_lot_id_control_lots_id_fk" FOREIGN KEY ("control_lot_id") REFERENCES "public"."control_lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_statistics_requests" ADD CONSTRAINT "peer_statistics_requests_analyte_id_analytes_id_fk" FOREIGN KEY ("analyte_id") REFERENCES "public"."analytes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_confirmed_by_users_id_fk" FOREIGN KEY ("confirmed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;