CREATE TYPE "public"."email_kind" AS ENUM('alert', 'alert_resolved', 'digest', 'other');--> statement-breakpoint
CREATE TYPE "public"."notification_mode" AS ENUM('immediate', 'digest', 'none');--> statement-breakpoint
ALTER TYPE "public"."email_status" ADD VALUE 'sending' BEFORE 'sent';--> statement-breakpoint
CREATE TABLE "captured_emails" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"message_id" text,
	"envelope_from" text,
	"envelope_to" text[] NOT NULL,
	"from" text,
	"to" text[] NOT NULL,
	"subject" text NOT NULL,
	"text" text,
	"html" text,
	"size_bytes" integer NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "notification_settings" (
	"user_id" uuid PRIMARY KEY NOT NULL,
	"modes" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"when_resolved" boolean DEFAULT false NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" uuid
);
--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD COLUMN "kind" "email_kind" DEFAULT 'other' NOT NULL;--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD COLUMN "html" text;--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD COLUMN "message_id" text DEFAULT '<' || gen_random_uuid() || '@tacklog.invalid>' NOT NULL;--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD COLUMN "dedupe_key" text;--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD COLUMN "recipient_user_id" uuid;--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD COLUMN "next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD COLUMN "claimed_by" text;--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD COLUMN "lease_until" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD COLUMN "smtp_response" text;--> statement-breakpoint
ALTER TABLE "notification_settings" ADD CONSTRAINT "notification_settings_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notification_settings" ADD CONSTRAINT "notification_settings_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "captured_emails_message_id_idx" ON "captured_emails" USING btree ("message_id");--> statement-breakpoint
CREATE INDEX "captured_emails_received_idx" ON "captured_emails" USING btree ("received_at");--> statement-breakpoint
ALTER TABLE "outgoing_emails" ADD CONSTRAINT "outgoing_emails_recipient_user_id_users_id_fk" FOREIGN KEY ("recipient_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "outgoing_emails_due_idx" ON "outgoing_emails" USING btree ("status","next_attempt_at");--> statement-breakpoint
CREATE UNIQUE INDEX "outgoing_emails_message_id_uq" ON "outgoing_emails" USING btree ("message_id");--> statement-breakpoint
CREATE UNIQUE INDEX "outgoing_emails_dedupe_uq" ON "outgoing_emails" USING btree ("dedupe_key");--> statement-breakpoint
CREATE INDEX "outgoing_emails_recipient_idx" ON "outgoing_emails" USING btree ("recipient_user_id","created_at");