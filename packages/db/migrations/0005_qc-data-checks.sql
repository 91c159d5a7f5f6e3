ALTER TABLE "analytes" ADD CONSTRAINT "analytes_tea_pct_positive" CHECK ("analytes"."tea_pct" is null or ("analytes"."tea_pct" > 0 and "analytes"."tea_pct" < 100));--> statement-breakpoint
ALTER TABLE "analytes" ADD CONSTRAINT "analytes_tea_absolute_positive" CHECK ("analytes"."tea_absolute" is null or ("analytes"."tea_absolute" > 0 and "analytes"."tea_absolute" < 'Infinity'::float8));--> statement-breakpoint
ALTER TABLE "analytes" ADD CONSTRAINT "analytes_plausible_range" CHECK (("analytes"."plausible_low" is null or ("analytes"."plausible_low" > '-Infinity'::float8 and "analytes"."plausible_low" < 'Infinity'::float8))
      and ("analytes"."plausible_high" is null or ("analytes"."plausible_high" > '-Infinity'::float8 and "analytes"."plausible_high" < 'Infinity'::float8))
      and ("analytes"."plausible_low" is null or "analytes"."plausible_high" is null or "analytes"."plausible_low" < "analytes"."plausible_high"));--> statement-breakpoint
ALTER TABLE "qc_summaries" ADD CONSTRAINT "qc_summaries_n_at_least_2" CHECK ("qc_summaries"."n" >= 2);--> statement-breakpoint
ALTER TABLE "qc_summaries" ADD CONSTRAINT "qc_summaries_level_positive" CHECK ("qc_summaries"."level" >= 1);--> statement-breakpoint
ALTER TABLE "qc_summaries" ADD CONSTRAINT "qc_summaries_mean_finite" CHECK ("qc_summaries"."mean" > '-Infinity'::float8 and "qc_summaries"."mean" < 'Infinity'::float8);--> statement-breakpoint
ALTER TABLE "qc_summaries" ADD CONSTRAINT "qc_summaries_sd_positive_finite" CHECK ("qc_summaries"."sd" > 0 and "qc_summaries"."sd" < 'Infinity'::float8);--> statement-breakpoint
ALTER TABLE "qc_values" ADD CONSTRAINT "qc_values_level_positive" CHECK ("qc_values"."level" >= 1);--> statement-breakpoint
ALTER TABLE "qc_values" ADD CONSTRAINT "qc_values_value_finite" CHECK ("qc_values"."value" > '-Infinity'::float8 and "qc_values"."value" < 'Infinity'::float8);--> statement-breakpoint
ALTER TABLE "qc_values" ADD CONSTRAINT "qc_values_z_finite" CHECK ("qc_values"."z" is null or ("qc_values"."z" > '-Infinity'::float8 and "qc_values"."z" < 'Infinity'::float8));