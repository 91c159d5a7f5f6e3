ALTER TABLE "qc_values" DROP CONSTRAINT "qc_values_lab_id_labs_id_fk";
--> statement-breakpoint
ALTER TABLE "qc_values" DROP CONSTRAINT "qc_values_procedure_id_procedures_id_fk";
--> statement-breakpoint
ALTER TABLE "qc_values" DROP CONSTRAINT "qc_values_control_lot_id_control_lots_id_fk";
--> statement-breakpoint
ALTER TABLE "qc_values" DROP CONSTRAINT "qc_values_upload_id_uploads_id_fk";
