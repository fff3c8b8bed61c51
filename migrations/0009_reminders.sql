CREATE TABLE "reminder_campaigns" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"created_by_id" uuid NOT NULL,
	"audience_count" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	CONSTRAINT "reminder_campaigns_kind" CHECK (kind in ('cooling_tune_up', 'heating_tune_up', 'filter', 'coil_cleaning')),
	CONSTRAINT "reminder_campaigns_audience" CHECK ("reminder_campaigns"."audience_count" >= 0)
);
--> statement-breakpoint
CREATE TABLE "reminder_sends" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"customer_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"email" text NOT NULL,
	"reason" text NOT NULL,
	"status" text DEFAULT 'pending' NOT NULL,
	"error" text,
	"sent_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "reminder_sends_status" CHECK ("reminder_sends"."status" in ('pending', 'sent', 'failed'))
);
--> statement-breakpoint
ALTER TABLE "reminder_campaigns" ADD CONSTRAINT "reminder_campaigns_created_by_id_users_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_sends" ADD CONSTRAINT "reminder_sends_campaign_id_reminder_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."reminder_campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_sends" ADD CONSTRAINT "reminder_sends_customer_id_customers_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "reminder_sends_campaign_customer_key" ON "reminder_sends" USING btree ("campaign_id","customer_id");--> statement-breakpoint
CREATE INDEX "reminder_sends_customer_kind_idx" ON "reminder_sends" USING btree ("customer_id","kind","sent_at");