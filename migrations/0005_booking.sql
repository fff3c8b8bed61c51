CREATE TABLE "booking_settings" (
	"id" smallint PRIMARY KEY DEFAULT 1 NOT NULL,
	"travel_buffer_minutes" integer DEFAULT 30 NOT NULL,
	"tune_up_minutes" integer DEFAULT 90 NOT NULL,
	"service_call_minutes" integer DEFAULT 120 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "booking_settings_single_row" CHECK ("booking_settings"."id" = 1),
	CONSTRAINT "booking_settings_buffer" CHECK ("booking_settings"."travel_buffer_minutes" between 0 and 240),
	CONSTRAINT "booking_settings_minutes" CHECK ("booking_settings"."tune_up_minutes" between 15 and 720 and "booking_settings"."service_call_minutes" between 15 and 720)
);
--> statement-breakpoint
CREATE TABLE "calendar_feed_tokens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"technician_id" uuid NOT NULL,
	"token_hash" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"revoked_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "technician_time_off" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"technician_id" uuid NOT NULL,
	"starts_at" timestamp with time zone NOT NULL,
	"ends_at" timestamp with time zone NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "technician_time_off_span" CHECK ("technician_time_off"."ends_at" > "technician_time_off"."starts_at")
);
--> statement-breakpoint
CREATE TABLE "visit_events" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"visit_id" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor_user_id" uuid,
	"action" text NOT NULL,
	"from_status" text,
	"to_status" text NOT NULL,
	"technician_id" uuid,
	"note" text DEFAULT '' NOT NULL,
	CONSTRAINT "visit_events_action" CHECK (action in ('booked', 'assigned', 'rescheduled', 'status', 'canceled'))
);
--> statement-breakpoint
ALTER TABLE "customers" ADD COLUMN "search_text" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "properties" ADD COLUMN "gate_code" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "properties" ADD COLUMN "pets" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "agreements" ADD COLUMN "stripe_payment_method_id" text;--> statement-breakpoint
ALTER TABLE "agreements" ADD COLUMN "card_brand" text;--> statement-breakpoint
ALTER TABLE "agreements" ADD COLUMN "card_last4" text;--> statement-breakpoint
ALTER TABLE "agreements" ADD COLUMN "charge_failed_on" date;--> statement-breakpoint
ALTER TABLE "agreements" ADD COLUMN "dunning_retries" smallint DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "agreements" ADD COLUMN "last_charge_error" text;--> statement-breakpoint
ALTER TABLE "agreements" ADD COLUMN "credit_cents" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "visits" ADD COLUMN "priority" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "visits" ADD COLUMN "sequence" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "visits" ADD COLUMN "photo_ids" text[] DEFAULT '{}' NOT NULL;--> statement-breakpoint
ALTER TABLE "visits" ADD COLUMN "reminder_sent_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "calendar_feed_tokens" ADD CONSTRAINT "calendar_feed_tokens_technician_id_technicians_id_fk" FOREIGN KEY ("technician_id") REFERENCES "public"."technicians"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "technician_time_off" ADD CONSTRAINT "technician_time_off_technician_id_technicians_id_fk" FOREIGN KEY ("technician_id") REFERENCES "public"."technicians"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_events" ADD CONSTRAINT "visit_events_visit_id_visits_id_fk" FOREIGN KEY ("visit_id") REFERENCES "public"."visits"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_events" ADD CONSTRAINT "visit_events_actor_user_id_users_id_fk" FOREIGN KEY ("actor_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_events" ADD CONSTRAINT "visit_events_technician_id_technicians_id_fk" FOREIGN KEY ("technician_id") REFERENCES "public"."technicians"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "calendar_feed_tokens_hash_key" ON "calendar_feed_tokens" USING btree ("token_hash");--> statement-breakpoint
CREATE UNIQUE INDEX "calendar_feed_tokens_live_key" ON "calendar_feed_tokens" USING btree ("technician_id") WHERE "calendar_feed_tokens"."revoked_at" is null;--> statement-breakpoint
CREATE INDEX "technician_time_off_tech_idx" ON "technician_time_off" USING btree ("technician_id","starts_at");--> statement-breakpoint
CREATE INDEX "visit_events_visit_idx" ON "visit_events" USING btree ("visit_id","at");--> statement-breakpoint
CREATE INDEX "customers_search_trgm_idx" ON "customers" USING gin ("search_text" gin_trgm_ops);--> statement-breakpoint
CREATE INDEX "customers_created_idx" ON "customers" USING btree ("created_at");--> statement-breakpoint
ALTER TABLE "agreements" ADD CONSTRAINT "agreements_credit" CHECK ("agreements"."credit_cents" >= 0);--> statement-breakpoint
ALTER TABLE "agreements" ADD CONSTRAINT "agreements_dunning" CHECK ("agreements"."dunning_retries" between 0 and 10);--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_sequence" CHECK ("visits"."sequence" >= 0);