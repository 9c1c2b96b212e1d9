CREATE TYPE "public"."alert_severity" AS ENUM('info', 'warning', 'critical');--> statement-breakpoint
CREATE TYPE "public"."alert_state" AS ENUM('open', 'acknowledged', 'resolved');--> statement-breakpoint
CREATE TYPE "public"."attachment_kind" AS ENUM('certificate', 'sds', 'other');--> statement-breakpoint
CREATE TYPE "public"."batch_status" AS ENUM('open', 'in_process', 'completed', 'cancelled');--> statement-breakpoint
CREATE TYPE "public"."container_status" AS ENUM('sealed', 'open', 'empty', 'scrapped');--> statement-breakpoint
CREATE TYPE "public"."driver_status" AS ENUM('in_process', 'passed', 'failed', 'reworked', 'scrapped');--> statement-breakpoint
CREATE TYPE "public"."email_status" AS ENUM('queued', 'sent', 'failed');--> statement-breakpoint
CREATE TYPE "public"."lot_status" AS ENUM('on_hold', 'released', 'quarantined', 'rejected', 'used_up');--> statement-breakpoint
CREATE TYPE "public"."material_kind" AS ENUM('adhesive', 'activator', 'hardener', 'wire', 'magnet', 'cone', 'spider', 'dust_cap', 'frame', 'other');--> statement-breakpoint
CREATE TYPE "public"."mix_status" AS ENUM('active', 'used_up', 'discarded');--> statement-breakpoint
CREATE TYPE "public"."role" AS ENUM('admin', 'receiving', 'assembler', 'quality', 'purchasing');--> statement-breakpoint
CREATE TYPE "public"."step_run_kind" AS ENUM('build', 'rework');--> statement-breakpoint
CREATE TYPE "public"."storage_class" AS ENUM('ambient', 'refrigerated', 'frozen');--> statement-breakpoint
CREATE TYPE "public"."test_result" AS ENUM('pass', 'fail');--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"password_hash" text NOT NULL,
	"roles" "role"[] DEFAULT '{}'::role[] NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "users_email_ck" CHECK (position('@' in "users"."email") > 1)
);
--> statement-breakpoint
CREATE TABLE "attachments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" "attachment_kind" NOT NULL,
	"filename" text NOT NULL,
	"mime_type" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"sha256" text NOT NULL,
	"storage_path" text NOT NULL,
	"uploaded_by" uuid,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "attachments_size_ck" CHECK ("attachments"."size_bytes" > 0),
	CONSTRAINT "attachments_sha_ck" CHECK ("attachments"."sha256" ~ '^[0-9a-f]{64}$')
);
--> statement-breakpoint
CREATE TABLE "defect_codes" (
	"code" text PRIMARY KEY NOT NULL,
	"description" text NOT NULL,
	"active" boolean DEFAULT true NOT NULL
);
--> statement-breakpoint
CREATE TABLE "driver_models" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"description" text,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "materials" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"kind" "material_kind" NOT NULL,
	"unit" text NOT NULL,
	"storage_class" "storage_class" DEFAULT 'ambient' NOT NULL,
	"shelf_life_days" integer,
	"open_life_hours" integer,
	"thawed_life_hours" integer,
	"out_of_storage_allowance_hours" integer,
	"pot_life_minutes" integer,
	"partner_material_id" uuid,
	"mix_ratio" numeric(12, 4),
	"cure" jsonb,
	"requires_inspection" boolean DEFAULT true NOT NULL,
	"hazards" jsonb DEFAULT '{"pictograms":[],"statements":[]}'::jsonb NOT NULL,
	"sds_attachment_id" uuid,
	"gtin" text,
	"reorder_point" numeric(14, 3),
	"order_quantity" numeric(14, 3),
	"lead_time_days" integer,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "materials_shelf_life_ck" CHECK ("materials"."shelf_life_days" IS NULL OR "materials"."shelf_life_days" > 0),
	CONSTRAINT "materials_open_life_ck" CHECK ("materials"."open_life_hours" IS NULL OR "materials"."open_life_hours" > 0),
	CONSTRAINT "materials_thawed_life_ck" CHECK ("materials"."thawed_life_hours" IS NULL OR "materials"."thawed_life_hours" > 0),
	CONSTRAINT "materials_pot_life_ck" CHECK ("materials"."pot_life_minutes" IS NULL OR "materials"."pot_life_minutes" > 0),
	CONSTRAINT "materials_lead_time_ck" CHECK ("materials"."lead_time_days" IS NULL OR "materials"."lead_time_days" >= 0),
	CONSTRAINT "materials_reorder_ck" CHECK ("materials"."reorder_point" IS NULL OR "materials"."reorder_point" >= 0),
	CONSTRAINT "materials_order_qty_ck" CHECK ("materials"."order_quantity" IS NULL OR "materials"."order_quantity" > 0),
	CONSTRAINT "materials_partner_ck" CHECK ("materials"."partner_material_id" IS NULL OR "materials"."partner_material_id" <> "materials"."id")
);
--> statement-breakpoint
CREATE TABLE "recipe_step_materials" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"step_id" uuid NOT NULL,
	"material_id" uuid NOT NULL,
	"amount_per_unit" numeric(14, 4) NOT NULL,
	CONSTRAINT "recipe_step_materials_amount_ck" CHECK ("recipe_step_materials"."amount_per_unit" > 0)
);
--> statement-breakpoint
CREATE TABLE "recipe_steps" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"model_id" uuid NOT NULL,
	"seq" integer NOT NULL,
	"name" text NOT NULL,
	"station_kind" text NOT NULL,
	"wait_for_cure" boolean DEFAULT false NOT NULL,
	CONSTRAINT "recipe_steps_seq_ck" CHECK ("recipe_steps"."seq" > 0)
);
--> statement-breakpoint
CREATE TABLE "stations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"area" text NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "stations_kind_ck" CHECK (length("stations"."kind") > 0)
);
--> statement-breakpoint
CREATE TABLE "suppliers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"contact_name" text,
	"email" text,
	"phone" text,
	"address" text,
	"notes" text,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "containers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"lot_id" uuid NOT NULL,
	"seq" integer NOT NULL,
	"quantity" numeric(14, 3) NOT NULL,
	"remaining" numeric(14, 3) NOT NULL,
	"status" "container_status" DEFAULT 'sealed' NOT NULL,
	"opened_at" timestamp with time zone,
	"thawed_at" timestamp with time zone,
	"out_of_storage_minutes" integer DEFAULT 0 NOT NULL,
	"out_of_storage_since" timestamp with time zone,
	"location" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "containers_quantity_ck" CHECK ("containers"."quantity" > 0),
	CONSTRAINT "containers_remaining_ck" CHECK ("containers"."remaining" >= 0 AND "containers"."remaining" <= "containers"."quantity"),
	CONSTRAINT "containers_seq_ck" CHECK ("containers"."seq" > 0),
	CONSTRAINT "containers_out_minutes_ck" CHECK ("containers"."out_of_storage_minutes" >= 0)
);
--> statement-breakpoint
CREATE TABLE "lots" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"material_id" uuid NOT NULL,
	"supplier_id" uuid NOT NULL,
	"supplier_lot" text NOT NULL,
	"gtin" text,
	"status" "lot_status" DEFAULT 'on_hold' NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"manufactured_on" date,
	"expires_on" date,
	"certificate_id" uuid,
	"certificate_expires_on" date,
	"notes" text,
	"received_by" uuid,
	"status_reason" text,
	"status_changed_at" timestamp with time zone,
	"status_changed_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "lots_supplier_lot_ck" CHECK (length("lots"."supplier_lot") > 0)
);
--> statement-breakpoint
CREATE TABLE "mixes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"station_id" uuid NOT NULL,
	"resin_container_id" uuid NOT NULL,
	"hardener_container_id" uuid NOT NULL,
	"resin_quantity" numeric(14, 3) NOT NULL,
	"hardener_quantity" numeric(14, 3) NOT NULL,
	"remaining" numeric(14, 3) NOT NULL,
	"mixed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"pot_life_ends_at" timestamp with time zone NOT NULL,
	"temp_c" numeric(5, 2),
	"status" "mix_status" DEFAULT 'active' NOT NULL,
	"mixed_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "mixes_parts_ck" CHECK ("mixes"."resin_container_id" <> "mixes"."hardener_container_id"),
	CONSTRAINT "mixes_quantity_ck" CHECK ("mixes"."resin_quantity" > 0 AND "mixes"."hardener_quantity" > 0),
	CONSTRAINT "mixes_remaining_ck" CHECK ("mixes"."remaining" >= 0)
);
--> statement-breakpoint
CREATE TABLE "build_batches" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"model_id" uuid NOT NULL,
	"quantity" integer NOT NULL,
	"status" "batch_status" DEFAULT 'open' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"completed_at" timestamp with time zone,
	CONSTRAINT "build_batches_quantity_ck" CHECK ("build_batches"."quantity" > 0 AND "build_batches"."quantity" <= 10000)
);
--> statement-breakpoint
CREATE TABLE "deviations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"batch_id" uuid,
	"step_id" uuid,
	"reason" text NOT NULL,
	"meaning" text DEFAULT 'approval' NOT NULL,
	"signed_by" uuid NOT NULL,
	"signed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"used_at" timestamp with time zone,
	CONSTRAINT "deviations_reason_ck" CHECK (length("deviations"."reason") >= 5)
);
--> statement-breakpoint
CREATE TABLE "drivers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"serial" text NOT NULL,
	"batch_id" uuid NOT NULL,
	"status" "driver_status" DEFAULT 'in_process' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"area" text NOT NULL,
	"at" timestamp with time zone NOT NULL,
	"temp_c" numeric(5, 2) NOT NULL,
	"rh_pct" numeric(5, 2),
	"source" text DEFAULT 'manual' NOT NULL,
	"recorded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "readings_temp_ck" CHECK ("readings"."temp_c" BETWEEN -60 AND 150),
	CONSTRAINT "readings_rh_ck" CHECK ("readings"."rh_pct" IS NULL OR "readings"."rh_pct" BETWEEN 0 AND 100)
);
--> statement-breakpoint
CREATE TABLE "station_loads" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"station_id" uuid NOT NULL,
	"batch_id" uuid NOT NULL,
	"container_id" uuid,
	"mix_id" uuid,
	"loaded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"loaded_by" uuid,
	"unloaded_at" timestamp with time zone,
	CONSTRAINT "station_loads_one_ck" CHECK (("station_loads"."container_id" IS NULL) <> ("station_loads"."mix_id" IS NULL))
);
--> statement-breakpoint
CREATE TABLE "step_run_materials" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"step_run_id" uuid NOT NULL,
	"container_id" uuid,
	"mix_id" uuid,
	"quantity_used" numeric(14, 3) DEFAULT '0' NOT NULL,
	"loaded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"loaded_by" uuid,
	CONSTRAINT "step_run_materials_one_ck" CHECK (("step_run_materials"."container_id" IS NULL) <> ("step_run_materials"."mix_id" IS NULL)),
	CONSTRAINT "step_run_materials_qty_ck" CHECK ("step_run_materials"."quantity_used" >= 0)
);
--> statement-breakpoint
CREATE TABLE "step_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"batch_id" uuid NOT NULL,
	"step_id" uuid NOT NULL,
	"station_id" uuid NOT NULL,
	"driver_id" uuid,
	"kind" "step_run_kind" DEFAULT 'build' NOT NULL,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	"started_by" uuid,
	"finished_by" uuid,
	"handling_at" timestamp with time zone,
	"cure_complete_at" timestamp with time zone,
	"short_cure" boolean DEFAULT false NOT NULL,
	"deviation_id" uuid,
	"units_done" integer,
	CONSTRAINT "step_runs_finish_ck" CHECK ("step_runs"."finished_at" IS NULL OR "step_runs"."finished_at" >= "step_runs"."started_at")
);
--> statement-breakpoint
CREATE TABLE "test_results" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"driver_id" uuid NOT NULL,
	"result" "test_result" NOT NULL,
	"defect_code" text,
	"measurements" jsonb,
	"tested_at" timestamp with time zone DEFAULT now() NOT NULL,
	"tested_by" uuid,
	CONSTRAINT "test_results_defect_ck" CHECK ("test_results"."result" = 'pass' OR "test_results"."defect_code" IS NOT NULL)
);
--> statement-breakpoint
CREATE TABLE "alerts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"severity" "alert_severity" NOT NULL,
	"state" "alert_state" DEFAULT 'open' NOT NULL,
	"subject_type" text NOT NULL,
	"subject_id" text NOT NULL,
	"message" text NOT NULL,
	"audience" "role"[] DEFAULT '{}'::role[] NOT NULL,
	"data" jsonb,
	"raised_at" timestamp with time zone DEFAULT now() NOT NULL,
	"acknowledged_at" timestamp with time zone,
	"acknowledged_by" uuid,
	"resolved_at" timestamp with time zone,
	"resolved_by" uuid,
	"resolution" text
);
--> statement-breakpoint
CREATE TABLE "audit_log" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor_id" uuid,
	"action" text NOT NULL,
	"entity_type" text NOT NULL,
	"entity_id" text NOT NULL,
	"before" jsonb,
	"after" jsonb,
	"reason" text
);
--> statement-breakpoint
CREATE TABLE "idempotency_keys" (
	"key" text NOT NULL,
	"actor_id" uuid NOT NULL,
	"method" text NOT NULL,
	"path" text NOT NULL,
	"status_code" integer,
	"response_body" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "idempotency_keys_actor_id_key_pk" PRIMARY KEY("actor_id","key")
);
--> statement-breakpoint
CREATE TABLE "outgoing_emails" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"to" text[] NOT NULL,
	"subject" text NOT NULL,
	"body" text NOT NULL,
	"status" "email_status" DEFAULT 'queued' NOT NULL,
	"alert_id" uuid,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "settings" (
	"key" text PRIMARY KEY NOT NULL,
	"value" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" uuid
);
--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "materials" ADD CONSTRAINT "materials_partner_material_id_materials_id_fk" FOREIGN KEY ("partner_material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "materials" ADD CONSTRAINT "materials_sds_attachment_id_attachments_id_fk" FOREIGN KEY ("sds_attachment_id") REFERENCES "public"."attachments"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recipe_step_materials" ADD CONSTRAINT "recipe_step_materials_step_id_recipe_steps_id_fk" FOREIGN KEY ("step_id") REFERENCES "public"."recipe_steps"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recipe_step_materials" ADD CONSTRAINT "recipe_step_materials_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recipe_steps" ADD CONSTRAINT "recipe_steps_model_id_driver_models_id_fk" FOREIGN KEY ("model_id") REFERENCES "public"."driver_models"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "containers" ADD CONSTRAINT "containers_lot_id_lots_id_fk" FOREIGN KEY ("lot_id") REFERENCES "public"."lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lots" ADD CONSTRAINT "lots_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lots" ADD CONSTRAINT "lots_supplier_id_suppliers_id_fk" FOREIGN KEY ("supplier_id") REFERENCES "public"."suppliers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lots" ADD CONSTRAINT "lots_certificate_id_attachments_id_fk" FOREIGN KEY ("certificate_id") REFERENCES "public"."attachments"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lots" ADD CONSTRAINT "lots_received_by_users_id_fk" FOREIGN KEY ("received_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lots" ADD CONSTRAINT "lots_status_changed_by_users_id_fk" FOREIGN KEY ("status_changed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mixes" ADD CONSTRAINT "mixes_station_id_stations_id_fk" FOREIGN KEY ("station_id") REFERENCES "public"."stations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mixes" ADD CONSTRAINT "mixes_resin_container_id_containers_id_fk" FOREIGN KEY ("resin_container_id") REFERENCES "public"."containers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mixes" ADD CONSTRAINT "mixes_hardener_container_id_containers_id_fk" FOREIGN KEY ("hardener_container_id") REFERENCES "public"."containers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mixes" ADD CONSTRAINT "mixes_mixed_by_users_id_fk" FOREIGN KEY ("mixed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_batches" ADD CONSTRAINT "build_batches_model_id_driver_models_id_fk" FOREIGN KEY ("model_id") REFERENCES "public"."driver_models"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_batches" ADD CONSTRAINT "build_batches_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deviations" ADD CONSTRAINT "deviations_batch_id_build_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."build_batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deviations" ADD CONSTRAINT "deviations_step_id_recipe_steps_id_fk" FOREIGN KEY ("step_id") REFERENCES "public"."recipe_steps"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deviations" ADD CONSTRAINT "deviations_signed_by_users_id_fk" FOREIGN KEY ("signed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "drivers" ADD CONSTRAINT "drivers_batch_id_build_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."build_batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "station_loads" ADD CONSTRAINT "station_loads_station_id_stations_id_fk" FOREIGN KEY ("station_id") REFERENCES "public"."stations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "station_loads" ADD CONSTRAINT "station_loads_batch_id_build_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."build_batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "station_loads" ADD CONSTRAINT "station_loads_container_id_containers_id_fk" FOREIGN KEY ("container_id") REFERENCES "public"."containers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "station_loads" ADD CONSTRAINT "station_loads_mix_id_mixes_id_fk" FOREIGN KEY ("mix_id") REFERENCES "public"."mixes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "station_loads" ADD CONSTRAINT "station_loads_loaded_by_users_id_fk" FOREIGN KEY ("loaded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_run_materials" ADD CONSTRAINT "step_run_materials_step_run_id_step_runs_id_fk" FOREIGN KEY ("step_run_id") REFERENCES "public"."step_runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_run_materials" ADD CONSTRAINT "step_run_materials_container_id_containers_id_fk" FOREIGN KEY ("container_id") REFERENCES "public"."containers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_run_materials" ADD CONSTRAINT "step_run_materials_mix_id_mixes_id_fk" FOREIGN KEY ("mix_id") REFERENCES "public"."mixes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_run_materials" ADD CONSTRAINT "step_run_materials_loaded_by_users_id_fk" FOREIGN KEY ("loaded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_runs" ADD CONSTRAINT "step_runs_batch_id_build_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."build_batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_runs" ADD CONSTRAINT "step_runs_step_id_recipe_steps_id_fk" FOREIGN KEY ("step_id") REFERENCES "public"."recipe_steps"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_runs" ADD CONSTRAINT "step_runs_station_id_stations_id_fk" FOREIGN KEY ("station_id") REFERENCES "public"."stations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_runs" ADD CONSTRAINT "step_runs_driver_id_drivers_id_fk" FOREIGN KEY ("driver_id") REFERENCES "public"."drivers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_runs" ADD CONSTRAINT "step_runs_started_by_users_id_fk" FOREIGN KEY ("started_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_runs" ADD CONSTRAINT "step_runs_finished_by_users_id_fk" FOREIGN KEY ("finished_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "step_runs" ADD CONSTRAINT "step_runs_deviation_id_deviations_id_fk" FOREIGN KEY ("deviation_id") REFERENCES "public"."deviations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "test_results" ADD CONSTRAINT "test_results_driver_id_drivers_id_fk" FOREIGN KEY ("driver_id") REFERENCES "public"."drivers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "test_results" ADD CONSTRAINT "test_results_defect_code_defect_codes_code_fk" FOREIGN KEY ("defect_code") REFERENCES "public"."defect_codes"("code") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "test_results" ADD CONSTRAINT "test_results_tested_by_users_id_fk" FOREIGN KEY ("tested_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alerts" ADD CONSTRAINT "alerts_acknowledged_by_users_id_fk" FOREIGN KEY ("acknowledged_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alerts" ADD CONSTRAINT "alerts_resolved_by_users_id_fk" FOREIGN KEY ("resolved_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_actor_id_users_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "idempotency_keys" ADD CONSTRAINT "idempotency_keys_actor_id_users_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD CONSTRAINT "outgoing_emails_alert_id_alerts_id_fk" FOREIGN KEY ("alert_id") REFERENCES "public"."alerts"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "settings" ADD CONSTRAINT "settings_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_lower_uq" ON "users" USING btree (lower("email"));--> statement-breakpoint
CREATE UNIQUE INDEX "driver_models_code_uq" ON "driver_models" USING btree ("code");--> statement-breakpoint
CREATE UNIQUE INDEX "materials_code_uq" ON "materials" USING btree ("code");--> statement-breakpoint
CREATE INDEX "materials_gtin_idx" ON "materials" USING btree ("gtin");--> statement-breakpoint
CREATE UNIQUE INDEX "recipe_step_materials_uq" ON "recipe_step_materials" USING btree ("step_id","material_id");--> statement-breakpoint
CREATE INDEX "recipe_step_materials_material_idx" ON "recipe_step_materials" USING btree ("material_id");--> statement-breakpoint
CREATE UNIQUE INDEX "recipe_steps_model_seq_uq" ON "recipe_steps" USING btree ("model_id","seq");--> statement-breakpoint
CREATE UNIQUE INDEX "stations_code_uq" ON "stations" USING btree ("code");--> statement-breakpoint
CREATE UNIQUE INDEX "suppliers_code_uq" ON "suppliers" USING btree ("code");--> statement-breakpoint
CREATE UNIQUE INDEX "suppliers_name_lower_uq" ON "suppliers" USING btree (lower("name"));--> statement-breakpoint
CREATE UNIQUE INDEX "containers_code_uq" ON "containers" USING btree ("code");--> statement-breakpoint
CREATE UNIQUE INDEX "containers_lot_seq_uq" ON "containers" USING btree ("lot_id","seq");--> statement-breakpoint
CREATE INDEX "lots_material_idx" ON "lots" USING btree ("material_id");--> statement-breakpoint
CREATE INDEX "lots_supplier_lot_idx" ON "lots" USING btree ("material_id","supplier_lot");--> statement-breakpoint
CREATE INDEX "lots_status_idx" ON "lots" USING btree ("status");--> statement-breakpoint
CREATE INDEX "lots_expires_idx" ON "lots" USING btree ("expires_on");--> statement-breakpoint
CREATE UNIQUE INDEX "mixes_code_uq" ON "mixes" USING btree ("code");--> statement-breakpoint
CREATE INDEX "mixes_resin_idx" ON "mixes" USING btree ("resin_container_id");--> statement-breakpoint
CREATE INDEX "mixes_hardener_idx" ON "mixes" USING btree ("hardener_container_id");--> statement-breakpoint
CREATE INDEX "mixes_station_idx" ON "mixes" USING btree ("station_id","status");--> statement-breakpoint
CREATE UNIQUE INDEX "build_batches_code_uq" ON "build_batches" USING btree ("code");--> statement-breakpoint
CREATE INDEX "build_batches_model_idx" ON "build_batches" USING btree ("model_id");--> statement-breakpoint
CREATE INDEX "deviations_batch_idx" ON "deviations" USING btree ("batch_id","step_id");--> statement-breakpoint
CREATE UNIQUE INDEX "drivers_serial_uq" ON "drivers" USING btree ("serial");--> statement-breakpoint
CREATE INDEX "drivers_batch_idx" ON "drivers" USING btree ("batch_id");--> statement-breakpoint
CREATE INDEX "readings_area_at_idx" ON "readings" USING btree ("area","at");--> statement-breakpoint
CREATE INDEX "station_loads_station_idx" ON "station_loads" USING btree ("station_id","unloaded_at");--> statement-breakpoint
CREATE INDEX "step_run_materials_run_idx" ON "step_run_materials" USING btree ("step_run_id");--> statement-breakpoint
CREATE INDEX "step_run_materials_container_idx" ON "step_run_materials" USING btree ("container_id");--> statement-breakpoint
CREATE INDEX "step_run_materials_mix_idx" ON "step_run_materials" USING btree ("mix_id");--> statement-breakpoint
CREATE INDEX "step_runs_batch_idx" ON "step_runs" USING btree ("batch_id","step_id");--> statement-breakpoint
CREATE INDEX "step_runs_driver_idx" ON "step_runs" USING btree ("driver_id");--> statement-breakpoint
CREATE INDEX "step_runs_station_idx" ON "step_runs" USING btree ("station_id","finished_at");--> statement-breakpoint
CREATE INDEX "test_results_driver_idx" ON "test_results" USING btree ("driver_id","tested_at");--> statement-breakpoint
CREATE UNIQUE INDEX "alerts_live_uq" ON "alerts" USING btree ("kind","subject_type","subject_id") WHERE "alerts"."state" <> 'resolved';--> statement-breakpoint
CREATE INDEX "alerts_state_idx" ON "alerts" USING btree ("state","raised_at");--> statement-breakpoint
CREATE INDEX "audit_log_entity_idx" ON "audit_log" USING btree ("entity_type","entity_id","at");--> statement-breakpoint
CREATE INDEX "audit_log_at_idx" ON "audit_log" USING btree ("at");--> statement-breakpoint
CREATE INDEX "idempotency_keys_created_idx" ON "idempotency_keys" USING btree ("created_at");--> statement-breakpoint
CREATE INDEX "outgoing_emails_status_idx" ON "outgoing_emails" USING btree ("status","created_at");