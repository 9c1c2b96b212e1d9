DROP INDEX "driver_models_code_uq";--> statement-breakpoint
ALTER TABLE "driver_models" ADD COLUMN "revision" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "driver_models" ADD COLUMN "current" boolean DEFAULT true NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "driver_models_code_revision_uq" ON "driver_models" USING btree ("code","revision");--> statement-breakpoint
CREATE UNIQUE INDEX "driver_models_current_uq" ON "driver_models" USING btree ("code") WHERE "driver_models"."current";--> statement-breakpoint
ALTER TABLE "driver_models" ADD CONSTRAINT "driver_models_revision_ck" CHECK ("driver_models"."revision" >= 1);