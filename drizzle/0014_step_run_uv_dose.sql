ALTER TABLE "step_runs" ADD COLUMN "exposure_seconds" numeric(8, 1);--> statement-breakpoint
ALTER TABLE "step_runs" ADD COLUMN "uv_irradiance_mw_cm2" numeric(8, 2);--> statement-breakpoint
ALTER TABLE "step_runs" ADD COLUMN "uv_dose_mj_cm2" numeric(12, 1);--> statement-breakpoint
ALTER TABLE "step_runs" ADD COLUMN "uv_dose_needed_mj_cm2" numeric(12, 1);