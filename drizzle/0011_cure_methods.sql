ALTER TABLE "readings" DROP CONSTRAINT "readings_temp_ck";--> statement-breakpoint
ALTER TABLE "readings" ALTER COLUMN "area" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "readings" ALTER COLUMN "temp_c" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "stations" ADD COLUMN "cure_environment" text DEFAULT 'area' NOT NULL;--> statement-breakpoint
ALTER TABLE "readings" ADD COLUMN "station_id" uuid;--> statement-breakpoint
ALTER TABLE "readings" ADD COLUMN "irradiance_mw_cm2" numeric(8, 2);--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_station_id_stations_id_fk" FOREIGN KEY ("station_id") REFERENCES "public"."stations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "readings_station_at_idx" ON "readings" USING btree ("station_id","at");--> statement-breakpoint
ALTER TABLE "stations" ADD CONSTRAINT "stations_cure_environment_ck" CHECK ("stations"."cure_environment" IN ('area', 'own'));--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_irradiance_ck" CHECK ("readings"."irradiance_mw_cm2" IS NULL OR "readings"."irradiance_mw_cm2" >= 0);--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_place_ck" CHECK (("readings"."area" IS NULL) <> ("readings"."station_id" IS NULL));--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_value_ck" CHECK ("readings"."temp_c" IS NOT NULL OR "readings"."irradiance_mw_cm2" IS NOT NULL);--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_temp_ck" CHECK ("readings"."temp_c" IS NULL OR "readings"."temp_c" BETWEEN -60 AND 400);