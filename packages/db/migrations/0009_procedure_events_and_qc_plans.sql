CREATE TABLE "procedure_events" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"procedure_id" uuid NOT NULL,
	"occurred_on" date NOT NULL,
	"kind" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"recorded_by" uuid,
	"recorded_by_label" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "procedure_events_kind_known" CHECK ("procedure_events"."kind" in ('reagent-lot', 'calibrator-lot', 'control-lot', 'maintenance', 'recalibration', 'software-update', 'other')),
	CONSTRAINT "procedure_events_note_length" CHECK (char_length("procedure_events"."note") <= 1000)
);
--> statement-breakpoint
CREATE TABLE "qc_plans" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"procedure_id" uuid NOT NULL,
	"level" integer NOT NULL,
	"rules" text NOT NULL,
	"n" integer NOT NULL,
	"runs" integer DEFAULT 1 NOT NULL,
	"updated_by" uuid,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "qc_plans_procedureId_level_unique" UNIQUE("procedure_id","level"),
	CONSTRAINT "qc_plans_n_range" CHECK ("qc_plans"."n" between 1 and 10),
	CONSTRAINT "qc_plans_runs_range" CHECK ("qc_plans"."runs" between 1 and 10)
);
--> statement-breakpoint
ALTER TABLE "procedure_events" ADD CONSTRAINT "procedure_events_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedure_events" ADD CONSTRAINT "procedure_events_procedure_id_procedures_id_fk" FOREIGN KEY ("procedure_id") REFERENCES "public"."procedures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedure_events" ADD CONSTRAINT "procedure_events_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_plans" ADD CONSTRAINT "qc_plans_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_plans" ADD CONSTRAINT "qc_plans_procedure_id_procedures_id_fk" FOREIGN KEY ("procedure_id") REFERENCES "public"."procedures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_plans" ADD CONSTRAINT "qc_plans_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "procedure_events_lab_id_procedure_id_occurred_on_index" ON "procedure_events" USING btree ("lab_id","procedure_id","occurred_on");