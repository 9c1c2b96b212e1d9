CREATE TABLE "sessions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"revoked_at" timestamp with time zone
);
--> statement-breakpoint
DROP INDEX "materials_gtin_idx";--> statement-breakpoint
ALTER TABLE "idempotency_keys" ADD COLUMN "request_hash" text;--> statement-breakpoint
ALTER TABLE "sessions" ADD CONSTRAINT "sessions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "sessions_user_idx" ON "sessions" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "sessions_expires_idx" ON "sessions" USING btree ("expires_at");--> statement-breakpoint
CREATE UNIQUE INDEX "materials_gtin_uq" ON "materials" USING btree ("gtin");--> statement-breakpoint
CREATE UNIQUE INDEX "station_loads_active_container_uq" ON "station_loads" USING btree ("station_id","batch_id","container_id") WHERE "station_loads"."unloaded_at" IS NULL AND "station_loads"."container_id" IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "station_loads_active_mix_uq" ON "station_loads" USING btree ("station_id","batch_id","mix_id") WHERE "station_loads"."unloaded_at" IS NULL AND "station_loads"."mix_id" IS NOT NULL;