ALTER TYPE "public"."upload_kind" ADD VALUE 'patient-results';--> statement-breakpoint
ALTER TYPE "public"."upload_kind" ADD VALUE 'fhir-bundle';--> statement-breakpoint
CREATE TABLE "current_intervals" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"analyte_id" uuid NOT NULL,
	"sex" text NOT NULL,
	"age_low" smallint NOT NULL,
	"age_high" smallint NOT NULL,
	"lower" double precision NOT NULL,
	"upper" double precision NOT NULL,
	"source" text NOT NULL,
	"adopted_from_result_id" uuid,
	"updated_by" uuid,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "current_intervals_labId_analyteId_sex_ageLow_ageHigh_unique" UNIQUE("lab_id","analyte_id","sex","age_low","age_high"),
	CONSTRAINT "current_intervals_order" CHECK ("current_intervals"."lower" < "current_intervals"."upper"),
	CONSTRAINT "current_intervals_sex" CHECK ("current_intervals"."sex" in ('all', 'female', 'male'))
);
--> statement-breakpoint
CREATE TABLE "interval_verifications" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"analyte_id" uuid NOT NULL,
	"interval" jsonb NOT NULL,
	"rounds" jsonb NOT NULL,
	"accepted" boolean NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"approved_at" timestamp with time zone,
	"approved_by" uuid,
	"approval_statement" text
);
--> statement-breakpoint
CREATE TABLE "patient_results" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"lab_id" uuid NOT NULL,
	"upload_id" uuid,
	"analyte_id" uuid NOT NULL,
	"value" double precision NOT NULL,
	"sex" text NOT NULL,
	"age_years" smallint NOT NULL,
	"collected_month" text NOT NULL,
	"setting" text NOT NULL,
	"sample_hash" text,
	CONSTRAINT "patient_results_sex" CHECK ("patient_results"."sex" in ('female', 'male')),
	CONSTRAINT "patient_results_age" CHECK ("patient_results"."age_years" between 0 and 130),
	CONSTRAINT "patient_results_month" CHECK ("patient_results"."collected_month" ~ '^[0-9]{4}-(0[1-9]|1[0-2])$')
);
--> statement-breakpoint
CREATE TABLE "ri_studies" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"analyte_id" uuid NOT NULL,
	"name" text NOT NULL,
	"selection" jsonb NOT NULL,
	"partitioning" jsonb NOT NULL,
	"method" text NOT NULL,
	"screening" text NOT NULL,
	"status" text DEFAULT 'draft' NOT NULL,
	"progress" real DEFAULT 0 NOT NULL,
	"failure_message" text,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "ri_studies_status" CHECK ("ri_studies"."status" in ('draft', 'queued', 'running', 'done', 'failed'))
);
--> statement-breakpoint
CREATE TABLE "ri_study_results" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"result" jsonb NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"approved_at" timestamp with time zone,
	"approved_by" uuid,
	"approval_statement" text,
	CONSTRAINT "ri_study_results_studyId_version_unique" UNIQUE("study_id","version")
);
--> statement-breakpoint
ALTER TABLE "current_intervals" ADD CONSTRAINT "current_intervals_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "current_intervals" ADD CONSTRAINT "current_intervals_analyte_id_analytes_id_fk" FOREIGN KEY ("analyte_id") REFERENCES "public"."analytes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "current_intervals" ADD CONSTRAINT "current_intervals_adopted_from_result_id_ri_study_results_id_fk" FOREIGN KEY ("adopted_from_result_id") REFERENCES "public"."ri_study_results"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "current_intervals" ADD CONSTRAINT "current_intervals_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "interval_verifications" ADD CONSTRAINT "interval_verifications_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "interval_verifications" ADD CONSTRAINT "interval_verifications_analyte_id_analytes_id_fk" FOREIGN KEY ("analyte_id") REFERENCES "public"."analytes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "interval_verifications" ADD CONSTRAINT "interval_verifications_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "interval_verifications" ADD CONSTRAINT "interval_verifications_approved_by_users_id_fk" FOREIGN KEY ("approved_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "patient_results" ADD CONSTRAINT "patient_results_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "patient_results" ADD CONSTRAINT "patient_results_upload_id_uploads_id_fk" FOREIGN KEY ("upload_id") REFERENCES "public"."uploads"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "patient_results" ADD CONSTRAINT "patient_results_analyte_id_analytes_id_fk" FOREIGN KEY ("analyte_id") REFERENCES "public"."analytes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ri_studies" ADD CONSTRAINT "ri_studies_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ri_studies" ADD CONSTRAINT "ri_studies_analyte_id_analytes_id_fk" FOREIGN KEY ("analyte_id") REFERENCES "public"."analytes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ri_studies" ADD CONSTRAINT "ri_studies_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ri_study_results" ADD CONSTRAINT "ri_study_results_study_id_ri_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."ri_studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ri_study_results" ADD CONSTRAINT "ri_study_results_approved_by_users_id_fk" FOREIGN KEY ("approved_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "interval_verifications_lab_id_created_at_index" ON "interval_verifications" USING btree ("lab_id","created_at");--> statement-breakpoint
CREATE INDEX "patient_results_lab_id_analyte_id_index" ON "patient_results" USING btree ("lab_id","analyte_id");--> statement-breakpoint
CREATE INDEX "patient_results_upload_id_index" ON "patient_results" USING btree ("upload_id");--> statement-breakpoint
CREATE INDEX "ri_studies_lab_id_created_at_index" ON "ri_studies" USING btree ("lab_id","created_at");