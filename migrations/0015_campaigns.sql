CREATE TABLE "filter_changes" (
	"equipment_id" uuid NOT NULL,
	"customer_id" uuid NOT NULL,
	"changed_on" date NOT NULL,
	"changed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "filter_changes_equipment_id_pk" PRIMARY KEY("equipment_id")
);
--> statement-breakpoint
CREATE TABLE "household_reminder_settings" (
	"customer_id" uuid PRIMARY KEY NOT NULL,
	"factors" text[] DEFAULT '{}' NOT NULL,
	"email_off" text[] DEFAULT '{}' NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "household_reminder_factors" CHECK (factors <@ array['pets', 'allergies', 'smokers', 'renovation_dust']::text[]),
	CONSTRAINT "household_reminder_email_off" CHECK (email_off <@ array['cooling_tune_up', 'heating_tune_up', 'filter', 'coil_cleaning', 'condensate_drain']::text[])
);
--> statement-breakpoint
CREATE TABLE "reminder_deliveries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"customer_id" uuid NOT NULL,
	"event" text NOT NULL,
	"detail" text DEFAULT '' NOT NULL,
	"permanent" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "reminder_campaigns" DROP CONSTRAINT "reminder_campaigns_kind";--> statement-breakpoint
ALTER TABLE "reminder_sends" DROP CONSTRAINT "reminder_sends_status";--> statement-breakpoint
DROP INDEX "reminder_sends_campaign_customer_key";--> statement-breakpoint
ALTER TABLE "reminder_campaigns" ADD COLUMN "status" text DEFAULT 'draft' NOT NULL;--> statement-breakpoint
ALTER TABLE "reminder_campaigns" ADD COLUMN "audience" jsonb DEFAULT '{}'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "reminder_campaigns" ADD COLUMN "scheduled_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "reminder_campaigns" ADD COLUMN "started_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "reminder_campaigns" ADD COLUMN "updated_at" timestamp with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "reminder_sends" ADD COLUMN "property_id" uuid;--> statement-breakpoint
ALTER TABLE "reminder_sends" ADD COLUMN "attempts" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "reminder_sends" ADD COLUMN "next_attempt_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "reminder_sends" ADD COLUMN "claimed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "filter_changes" ADD CONSTRAINT "filter_changes_equipment_id_equipment_id_fk" FOREIGN KEY ("equipment_id") REFERENCES "public"."equipment"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "filter_changes" ADD CONSTRAINT "filter_changes_customer_id_customers_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "household_reminder_settings" ADD CONSTRAINT "household_reminder_settings_customer_id_customers_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_deliveries" ADD CONSTRAINT "reminder_deliveries_campaign_id_reminder_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."reminder_campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_deliveries" ADD CONSTRAINT "reminder_deliveries_customer_id_customers_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "filter_changes_customer_idx" ON "filter_changes" USING btree ("customer_id");--> statement-breakpoint
CREATE INDEX "reminder_deliveries_campaign_idx" ON "reminder_deliveries" USING btree ("campaign_id","created_at");--> statement-breakpoint
CREATE INDEX "reminder_deliveries_customer_idx" ON "reminder_deliveries" USING btree ("customer_id","created_at");--> statement-breakpoint
ALTER TABLE "reminder_sends" ADD CONSTRAINT "reminder_sends_property_id_properties_id_fk" FOREIGN KEY ("property_id") REFERENCES "public"."properties"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "reminder_campaigns_due_idx" ON "reminder_campaigns" USING btree ("status","scheduled_at");--> statement-breakpoint
CREATE UNIQUE INDEX "reminder_sends_campaign_customer_kind_key" ON "reminder_sends" USING btree ("campaign_id","customer_id","kind");--> statement-breakpoint
CREATE INDEX "reminder_sends_campaign_status_idx" ON "reminder_sends" USING btree ("campaign_id","status");--> statement-breakpoint
ALTER TABLE "reminder_campaigns" ADD CONSTRAINT "reminder_campaigns_status" CHECK (status in ('draft', 'scheduled', 'sending', 'paused', 'cancelled', 'done'));--> statement-breakpoint
ALTER TABLE "reminder_campaigns" ADD CONSTRAINT "reminder_campaigns_kind" CHECK (kind in ('cooling_tune_up', 'heating_tune_up', 'filter', 'coil_cleaning', 'condensate_drain'));--> statement-breakpoint
ALTER TABLE "reminder_sends" ADD CONSTRAINT "reminder_sends_status" CHECK (status in ('pending', 'sending', 'sent', 'failed', 'suppressed', 'cancelled'));--> statement-breakpoint
-- Campaigns sent before statuses existed were sent at once.
UPDATE "reminder_campaigns" SET "status" = CASE WHEN "finished_at" IS NOT NULL THEN 'done' ELSE 'sending' END, "started_at" = "created_at";--> statement-breakpoint
UPDATE "reminder_sends" SET "status" = 'suppressed' WHERE "status" = 'failed' AND "error" = 'Unsubscribed: not sent.';
