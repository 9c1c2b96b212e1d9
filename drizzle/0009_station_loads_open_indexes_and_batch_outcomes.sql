CREATE TABLE "batch_outcomes" (
	"batch_id" uuid PRIMARY KEY NOT NULL,
	"drivers" integer DEFAULT 0 NOT NULL,
	"tested" integer DEFAULT 0 NOT NULL,
	"failed" integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
ALTER TABLE "batch_outcomes" ADD CONSTRAINT "batch_outcomes_batch_id_build_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."build_batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "station_loads_open_container_idx" ON "station_loads" USING btree ("container_id") WHERE "station_loads"."unloaded_at" IS NULL;--> statement-breakpoint
CREATE INDEX "station_loads_open_mix_idx" ON "station_loads" USING btree ("mix_id") WHERE "station_loads"."unloaded_at" IS NULL;