CREATE TYPE "public"."role" AS ENUM('analyst', 'supervisor', 'coordinator');--> statement-breakpoint
CREATE TYPE "public"."period_state" AS ENUM('open', 'closed', 'published');--> statement-breakpoint
CREATE TYPE "public"."upload_kind" AS ENUM('qc-summary', 'qc-values');--> statement-breakpoint
CREATE TYPE "public"."upload_status" AS ENUM('queued', 'processing', 'needs-review', 'stored', 'failed', 'cancelled');--> statement-breakpoint
CREATE TYPE "public"."peer_tier" AS ENUM('instrument', 'method', 'analyte');--> statement-breakpoint
CREATE TABLE "labs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"preferred_units" text DEFAULT 'si' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "labs_code_unique" UNIQUE("code")
);
--> statement-breakpoint
CREATE TABLE "lab_api_tokens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"name" text NOT NULL,
	"prefix" text NOT NULL,
	"token_hash" text NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_used_at" timestamp with time zone,
	"revoked_at" timestamp with time zone,
	CONSTRAINT "lab_api_tokens_tokenHash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "revoked_sessions" (
	"jti" text PRIMARY KEY NOT NULL,
	"expires_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"password_hash" text,
	"role" "role" NOT NULL,
	"lab_id" uuid,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "users_email_unique" UNIQUE("email")
);
--> statement-breakpoint
CREATE TABLE "analytes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"loinc" text,
	"unit" text NOT NULL,
	"conventional_unit" text,
	"molar_mass" double precision,
	"decimals" integer DEFAULT 2 NOT NULL,
	"tea_pct" double precision,
	"tea_source" text,
	"tea_date" date,
	"retired_at" timestamp with time zone,
	CONSTRAINT "analytes_code_unique" UNIQUE("code")
);
--> statement-breakpoint
CREATE TABLE "control_lot_levels" (
	"control_lot_id" uuid NOT NULL,
	"level" integer NOT NULL,
	"description" text,
	CONSTRAINT "control_lot_levels_control_lot_id_level_pk" PRIMARY KEY("control_lot_id","level")
);
--> statement-breakpoint
CREATE TABLE "control_lots" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"material_id" uuid NOT NULL,
	"lot_number" text NOT NULL,
	"levels" integer[] NOT NULL,
	"expires_on" date NOT NULL,
	"state" text DEFAULT 'active' NOT NULL,
	CONSTRAINT "control_lots_lotNumber_unique" UNIQUE("lot_number"),
	CONSTRAINT "control_lots_materialId_lotNumber_unique" UNIQUE("material_id","lot_number")
);
--> statement-breakpoint
CREATE TABLE "control_materials" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"manufacturer" text,
	"matrix" text,
	"retired_at" timestamp with time zone,
	CONSTRAINT "control_materials_code_unique" UNIQUE("code")
);
--> statement-breakpoint
CREATE TABLE "instrument_models" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"manufacturer" text,
	"retired_at" timestamp with time zone,
	CONSTRAINT "instrument_models_code_unique" UNIQUE("code")
);
--> statement-breakpoint
CREATE TABLE "methods" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"principle" text,
	"retired_at" timestamp with time zone,
	CONSTRAINT "methods_code_unique" UNIQUE("code")
);
--> statement-breakpoint
CREATE TABLE "reagents" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"manufacturer" text,
	"retired_at" timestamp with time zone,
	CONSTRAINT "reagents_code_unique" UNIQUE("code")
);
--> statement-breakpoint
CREATE TABLE "procedures" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"code" text NOT NULL,
	"analyte_id" uuid NOT NULL,
	"instrument_model_id" uuid NOT NULL,
	"method_id" uuid NOT NULL,
	"reagent_id" uuid NOT NULL,
	"unit" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"retired_at" timestamp with time zone,
	CONSTRAINT "procedures_labId_code_unique" UNIQUE("lab_id","code")
);
--> statement-breakpoint
CREATE TABLE "periods" (
	"period" text PRIMARY KEY NOT NULL,
	"state" "period_state" DEFAULT 'open' NOT NULL,
	"deadline" timestamp with time zone NOT NULL,
	"closed_at" timestamp with time zone,
	"published_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "publications" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"period" text NOT NULL,
	"version" integer NOT NULL,
	"reason" text,
	"published_by" uuid,
	"published_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "publications_period_version_unique" UNIQUE("period","version")
);
--> statement-breakpoint
CREATE TABLE "column_mappings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"kind" "upload_kind" NOT NULL,
	"mapping" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "column_mappings_labId_kind_unique" UNIQUE("lab_id","kind")
);
--> statement-breakpoint
CREATE TABLE "uploads" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"uploaded_by" uuid,
	"token_id" uuid,
	"kind" "upload_kind" NOT NULL,
	"filename" text NOT NULL,
	"size" bigint NOT NULL,
	"sha256" text NOT NULL,
	"storage_key" text NOT NULL,
	"column_mapping" jsonb,
	"status" "upload_status" DEFAULT 'queued' NOT NULL,
	"progress" real DEFAULT 0 NOT NULL,
	"rows_total" integer DEFAULT 0 NOT NULL,
	"rows_accepted" integer DEFAULT 0 NOT NULL,
	"rows_rejected" integer DEFAULT 0 NOT NULL,
	"errors" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"failure_message" text,
	"duplicate_of" uuid,
	"attempts" integer DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"stored_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "qc_summaries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"procedure_id" uuid NOT NULL,
	"control_lot_id" uuid NOT NULL,
	"level" integer NOT NULL,
	"period" text NOT NULL,
	"n" integer NOT NULL,
	"mean" double precision NOT NULL,
	"sd" double precision NOT NULL,
	"source" text DEFAULT 'summary' NOT NULL,
	"late" boolean DEFAULT false NOT NULL,
	"upload_id" uuid,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "qc_summaries_procedureId_controlLotId_level_period_unique" UNIQUE("procedure_id","control_lot_id","level","period")
);
--> statement-breakpoint
CREATE TABLE "qc_values" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"lab_id" uuid NOT NULL,
	"procedure_id" uuid NOT NULL,
	"control_lot_id" uuid NOT NULL,
	"level" integer NOT NULL,
	"period" text NOT NULL,
	"measured_at" timestamp with time zone NOT NULL,
	"value" double precision NOT NULL,
	"run" text,
	"comment" text,
	"z" double precision,
	"rules" text[] DEFAULT '{}' NOT NULL,
	"upload_id" uuid
);
--> statement-breakpoint
CREATE TABLE "peer_exclusions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"procedure_id" uuid NOT NULL,
	"control_lot_id" uuid NOT NULL,
	"level" integer,
	"period" text NOT NULL,
	"reason" text NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"revoked_at" timestamp with time zone,
	"revoked_by" uuid
);
--> statement-breakpoint
CREATE TABLE "peer_group_assignments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"procedure_id" uuid NOT NULL,
	"control_lot_id" uuid NOT NULL,
	"tier" "peer_tier" NOT NULL,
	"peer_group_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "peer_group_assignments_procedureId_controlLotId_tier_unique" UNIQUE("procedure_id","control_lot_id","tier")
);
--> statement-breakpoint
CREATE TABLE "peer_groups" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"control_lot_id" uuid NOT NULL,
	"analyte_id" uuid NOT NULL,
	"tier" "peer_tier" NOT NULL,
	"key" text NOT NULL,
	"label" text NOT NULL,
	"merged_into_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "peer_groups_controlLotId_analyteId_tier_key_unique" UNIQUE("control_lot_id","analyte_id","tier","key")
);
--> statement-breakpoint
CREATE TABLE "peer_statistics" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"peer_group_id" uuid NOT NULL,
	"level" integer NOT NULL,
	"period" text NOT NULL,
	"scope" text DEFAULT 'period' NOT NULL,
	"version" integer DEFAULT 0 NOT NULL,
	"labs" integer NOT NULL,
	"n" integer NOT NULL,
	"mean" double precision,
	"sd" double precision,
	"cv" double precision,
	"within_sd" double precision,
	"within_cv" double precision,
	"robust_mean" double precision,
	"robust_sd" double precision,
	"sufficient" boolean NOT NULL,
	"excluded" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"members" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "peer_statistics_peerGroupId_level_period_scope_version_unique" UNIQUE("peer_group_id","level","period","scope","version")
);
--> statement-breakpoint
CREATE TABLE "period_signoffs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"period" text NOT NULL,
	"signed_by" uuid NOT NULL,
	"statement" text NOT NULL,
	"signed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "period_signoffs_labId_period_unique" UNIQUE("lab_id","period")
);
--> statement-breakpoint
CREATE TABLE "review_comments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"period" text NOT NULL,
	"procedure_id" uuid NOT NULL,
	"control_lot_id" uuid NOT NULL,
	"level" integer NOT NULL,
	"body" text NOT NULL,
	"author_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "audit_events" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor_id" uuid,
	"actor_label" text,
	"lab_id" uuid,
	"kind" text NOT NULL,
	"entity" text,
	"entity_id" text,
	"details" jsonb DEFAULT '{}'::jsonb NOT NULL
);
--> statement-breakpoint
ALTER TABLE "lab_api_tokens" ADD CONSTRAINT "lab_api_tokens_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_api_tokens" ADD CONSTRAINT "lab_api_tokens_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "users" ADD CONSTRAINT "users_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "control_lot_levels" ADD CONSTRAINT "control_lot_levels_control_lot_id_control_lots_id_fk" FOREIGN KEY ("control_lot_id") REFERENCES "public"."control_lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "control_lots" ADD CONSTRAINT "control_lots_material_id_control_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."control_materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedures" ADD CONSTRAINT "procedures_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedures" ADD CONSTRAINT "procedures_analyte_id_analytes_id_fk" FOREIGN KEY ("analyte_id") REFERENCES "public"."analytes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedures" ADD CONSTRAINT "procedures_instrument_model_id_instrument_models_id_fk" FOREIGN KEY ("instrument_model_id") REFERENCES "public"."instrument_models"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedures" ADD CONSTRAINT "procedures_method_id_methods_id_fk" FOREIGN KEY ("method_id") REFERENCES "public"."methods"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedures" ADD CONSTRAINT "procedures_reagent_id_reagents_id_fk" FOREIGN KEY ("reagent_id") REFERENCES "public"."reagents"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "publications" ADD CONSTRAINT "publications_period_periods_period_fk" FOREIGN KEY ("period") REFERENCES "public"."periods"("period") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "publications" ADD CONSTRAINT "publications_published_by_users_id_fk" FOREIGN KEY ("published_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "column_mappings" ADD CONSTRAINT "column_mappings_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_token_id_lab_api_tokens_id_fk" FOREIGN KEY ("token_id") REFERENCES "public"."lab_api_tokens"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_summaries" ADD CONSTRAINT "qc_summaries_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_summaries" ADD CONSTRAINT "qc_summaries_procedure_id_procedures_id_fk" FOREIGN KEY ("procedure_id") REFERENCES "public"."procedures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_summaries" ADD CONSTRAINT "qc_summaries_control_lot_id_control_lots_id_fk" FOREIGN KEY ("control_lot_id") REFERENCES "public"."control_lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_summaries" ADD CONSTRAINT "qc_summaries_period_periods_period_fk" FOREIGN KEY ("period") REFERENCES "public"."periods"("period") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_summaries" ADD CONSTRAINT "qc_summaries_upload_id_uploads_id_fk" FOREIGN KEY ("upload_id") REFERENCES "public"."uploads"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_values" ADD CONSTRAINT "qc_values_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_values" ADD CONSTRAINT "qc_values_procedure_id_procedures_id_fk" FOREIGN KEY ("procedure_id") REFERENCES "public"."procedures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_values" ADD CONSTRAINT "qc_values_control_lot_id_control_lots_id_fk" FOREIGN KEY ("control_lot_id") REFERENCES "public"."control_lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "qc_values" ADD CONSTRAINT "qc_values_upload_id_uploads_id_fk" FOREIGN KEY ("upload_id") REFERENCES "public"."uploads"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_exclusions" ADD CONSTRAINT "peer_exclusions_procedure_id_procedures_id_fk" FOREIGN KEY ("procedure_id") REFERENCES "public"."procedures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_exclusions" ADD CONSTRAINT "peer_exclusions_control_lot_id_control_lots_id_fk" FOREIGN KEY ("control_lot_id") REFERENCES "public"."control_lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_exclusions" ADD CONSTRAINT "peer_exclusions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_exclusions" ADD CONSTRAINT "peer_exclusions_revoked_by_users_id_fk" FOREIGN KEY ("revoked_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_group_assignments" ADD CONSTRAINT "peer_group_assignments_procedure_id_procedures_id_fk" FOREIGN KEY ("procedure_id") REFERENCES "public"."procedures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_group_assignments" ADD CONSTRAINT "peer_group_assignments_control_lot_id_control_lots_id_fk" FOREIGN KEY ("control_lot_id") REFERENCES "public"."control_lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_group_assignments" ADD CONSTRAINT "peer_group_assignments_peer_group_id_peer_groups_id_fk" FOREIGN KEY ("peer_group_id") REFERENCES "public"."peer_groups"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_groups" ADD CONSTRAINT "peer_groups_control_lot_id_control_lots_id_fk" FOREIGN KEY ("control_lot_id") REFERENCES "public"."control_lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_groups" ADD CONSTRAINT "peer_groups_analyte_id_analytes_id_fk" FOREIGN KEY ("analyte_id") REFERENCES "public"."analytes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "peer_statistics" ADD CONSTRAINT "peer_statistics_peer_group_id_peer_groups_id_fk" FOREIGN KEY ("peer_group_id") REFERENCES "public"."peer_groups"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "period_signoffs" ADD CONSTRAINT "period_signoffs_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "period_signoffs" ADD CONSTRAINT "period_signoffs_period_periods_period_fk" FOREIGN KEY ("period") REFERENCES "public"."periods"("period") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "period_signoffs" ADD CONSTRAINT "period_signoffs_signed_by_users_id_fk" FOREIGN KEY ("signed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_period_periods_period_fk" FOREIGN KEY ("period") REFERENCES "public"."periods"("period") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_procedure_id_procedures_id_fk" FOREIGN KEY ("procedure_id") REFERENCES "public"."procedures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_control_lot_id_control_lots_id_fk" FOREIGN KEY ("control_lot_id") REFERENCES "public"."control_lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_actor_id_users_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "lab_api_tokens_lab_id_index" ON "lab_api_tokens" USING btree ("lab_id");--> statement-breakpoint
CREATE INDEX "users_lab_id_index" ON "users" USING btree ("lab_id");--> statement-breakpoint
CREATE INDEX "procedures_analyte_id_index" ON "procedures" USING btree ("analyte_id");--> statement-breakpoint
CREATE INDEX "uploads_lab_id_created_at_index" ON "uploads" USING btree ("lab_id","created_at");--> statement-breakpoint
CREATE INDEX "uploads_status_index" ON "uploads" USING btree ("status");--> statement-breakpoint
CREATE INDEX "uploads_lab_id_sha256_index" ON "uploads" USING btree ("lab_id","sha256");--> statement-breakpoint
CREATE INDEX "qc_summaries_control_lot_id_level_period_index" ON "qc_summaries" USING btree ("control_lot_id","level","period");--> statement-breakpoint
CREATE INDEX "qc_summaries_lab_id_period_index" ON "qc_summaries" USING btree ("lab_id","period");--> statement-breakpoint
CREATE INDEX "qc_values_procedure_id_control_lot_id_period_measured_at_index" ON "qc_values" USING btree ("procedure_id","control_lot_id","period","measured_at");--> statement-breakpoint
CREATE INDEX "qc_values_upload_id_index" ON "qc_values" USING btree ("upload_id");--> statement-breakpoint
CREATE INDEX "peer_exclusions_control_lot_id_period_index" ON "peer_exclusions" USING btree ("control_lot_id","period");--> statement-breakpoint
CREATE INDEX "peer_groups_control_lot_id_analyte_id_index" ON "peer_groups" USING btree ("control_lot_id","analyte_id");--> statement-breakpoint
CREATE INDEX "peer_statistics_period_version_index" ON "peer_statistics" USING btree ("period","version");--> statement-breakpoint
CREATE INDEX "review_comments_lab_id_period_index" ON "review_comments" USING btree ("lab_id","period");--> statement-breakpoint
CREATE INDEX "audit_events_at_index" ON "audit_events" USING btree ("at");--> statement-breakpoint
CREATE INDEX "audit_events_actor_id_index" ON "audit_events" USING btree ("actor_id");--> statement-breakpoint
CREATE INDEX "audit_events_lab_id_index" ON "audit_events" USING btree ("lab_id");--> statement-breakpoint
CREATE INDEX "audit_events_kind_index" ON "audit_events" USING btree ("kind");