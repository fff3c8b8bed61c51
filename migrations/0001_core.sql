CREATE TABLE "company" (
	"id" smallint PRIMARY KEY DEFAULT 1 NOT NULL,
	"name" text NOT NULL,
	"phone" text NOT NULL,
	"email" text NOT NULL,
	"street" text NOT NULL,
	"city" text NOT NULL,
	"state" text NOT NULL,
	"zip" text NOT NULL,
	"time_zone" text DEFAULT 'America/Chicago' NOT NULL,
	"tax_rate_bps" integer DEFAULT 0 NOT NULL,
	"business_hours" jsonb NOT NULL,
	"arrival_window_minutes" integer DEFAULT 120 NOT NULL,
	"lead_time_minutes" integer DEFAULT 120 NOT NULL,
	"held_back_pct" integer DEFAULT 25 NOT NULL,
	"cancel_cutoff_hours" integer DEFAULT 24 NOT NULL,
	"diagnostic_fee_cents" integer DEFAULT 0 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "company_single_row" CHECK ("company"."id" = 1),
	CONSTRAINT "company_tax_rate" CHECK ("company"."tax_rate_bps" between 0 and 5000),
	CONSTRAINT "company_held_back" CHECK ("company"."held_back_pct" between 0 and 100),
	CONSTRAINT "company_window" CHECK ("company"."arrival_window_minutes" between 30 and 480),
	CONSTRAINT "company_fee" CHECK ("company"."diagnostic_fee_cents" >= 0)
);
--> statement-breakpoint
CREATE TABLE "customers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"email" text,
	"phone" text,
	"notes" text DEFAULT '' NOT NULL,
	"archived_at" timestamp with time zone,
	"merged_into_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "customers_phone_e164" CHECK ("customers"."phone" is null or "customers"."phone" ~ '^\+[1-9][0-9]{6,14}$')
);
--> statement-breakpoint
CREATE TABLE "properties" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"customer_id" uuid NOT NULL,
	"label" text DEFAULT 'Home' NOT NULL,
	"street" text NOT NULL,
	"unit" text,
	"city" text NOT NULL,
	"state" text NOT NULL,
	"zip" text NOT NULL,
	"area" text DEFAULT '' NOT NULL,
	"elevation_ft" integer,
	"access_notes" text DEFAULT '' NOT NULL,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "properties_state" CHECK ("properties"."state" ~ '^[A-Z]{2}$'),
	CONSTRAINT "properties_zip" CHECK ("properties"."zip" ~ '^[0-9]{5}(-[0-9]{4})?$'),
	CONSTRAINT "properties_elevation" CHECK ("properties"."elevation_ft" is null or "properties"."elevation_ft" between -1000 and 15000)
);
--> statement-breakpoint
CREATE TABLE "equipment" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"property_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"make" text DEFAULT '' NOT NULL,
	"model" text DEFAULT '' NOT NULL,
	"serial" text DEFAULT '' NOT NULL,
	"installed_on" date,
	"refrigerant" text,
	"metering_device" text,
	"capacity_btuh" integer,
	"volts" integer,
	"phase" smallint,
	"rated_amps" double precision,
	"filter_size" text DEFAULT '' NOT NULL,
	"filter_type" text DEFAULT '' NOT NULL,
	"merv" smallint,
	"warranty_ends_on" date,
	"location" text DEFAULT '' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "equipment_kind" CHECK (kind in ('condensing_unit', 'heat_pump', 'air_handler', 'gas_furnace', 'geothermal_heat_pump', 'ductless', 'thermostat', 'condensate_pump', 'humidifier', 'air_cleaner')),
	CONSTRAINT "equipment_refrigerant" CHECK (refrigerant is null or refrigerant in ('R-410A', 'R-22', 'R-32', 'R-454B')),
	CONSTRAINT "equipment_metering" CHECK (metering_device is null or metering_device in ('fixed', 'txv', 'eev')),
	CONSTRAINT "equipment_capacity" CHECK ("equipment"."capacity_btuh" is null or "equipment"."capacity_btuh" between 1000 and 600000),
	CONSTRAINT "equipment_volts" CHECK ("equipment"."volts" is null or "equipment"."volts" between 12 and 600),
	CONSTRAINT "equipment_phase" CHECK ("equipment"."phase" is null or "equipment"."phase" in (1, 3)),
	CONSTRAINT "equipment_amps" CHECK ("equipment"."rated_amps" is null or "equipment"."rated_amps" > 0),
	CONSTRAINT "equipment_merv" CHECK ("equipment"."merv" is null or "equipment"."merv" between 1 and 16)
);
--> statement-breakpoint
CREATE TABLE "agreements" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"customer_id" uuid NOT NULL,
	"property_id" uuid NOT NULL,
	"plan_version_id" uuid NOT NULL,
	"status" text NOT NULL,
	"starts_on" date NOT NULL,
	"ends_on" date NOT NULL,
	"systems_count" smallint DEFAULT 1 NOT NULL,
	"price_cents" integer NOT NULL,
	"auto_renew" boolean DEFAULT false NOT NULL,
	"canceled_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "agreements_status" CHECK (status in ('pending', 'active', 'renewal_due', 'past_due', 'lapsed', 'canceled')),
	CONSTRAINT "agreements_term" CHECK ("agreements"."ends_on" > "agreements"."starts_on"),
	CONSTRAINT "agreements_systems" CHECK ("agreements"."systems_count" between 1 and 20),
	CONSTRAINT "agreements_price" CHECK ("agreements"."price_cents" >= 0)
);
--> statement-breakpoint
CREATE TABLE "plan_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"plan_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"yearly_price_cents" integer NOT NULL,
	"additional_system_cents" integer NOT NULL,
	"cooling_visits" smallint NOT NULL,
	"heating_visits" smallint NOT NULL,
	"repair_discount_bps" integer NOT NULL,
	"diagnostic_fee_waived" boolean NOT NULL,
	"priority_window_hours" integer NOT NULL,
	"extras" text[] DEFAULT '{}' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "plan_versions_price" CHECK ("plan_versions"."yearly_price_cents" >= 0 and "plan_versions"."additional_system_cents" >= 0),
	CONSTRAINT "plan_versions_visits" CHECK ("plan_versions"."cooling_visits" between 0 and 12 and "plan_versions"."heating_visits" between 0 and 12),
	CONSTRAINT "plan_versions_discount" CHECK ("plan_versions"."repair_discount_bps" between 0 and 10000),
	CONSTRAINT "plan_versions_priority" CHECK ("plan_versions"."priority_window_hours" between 1 and 720)
);
--> statement-breakpoint
CREATE TABLE "plans" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"sort_order" smallint DEFAULT 0 NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "technicians" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"skills" text[] DEFAULT '{}' NOT NULL,
	"weekly_hours" jsonb NOT NULL,
	"truck" text DEFAULT '' NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"role" text NOT NULL,
	"password_hash" text,
	"customer_id" uuid,
	"disabled_at" timestamp with time zone,
	"last_sign_in_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "users_email_lower" CHECK ("users"."email" = lower("users"."email")),
	CONSTRAINT "users_role" CHECK (role in ('homeowner', 'technician', 'office', 'owner')),
	CONSTRAINT "users_homeowner_household" CHECK ("users"."role" <> 'homeowner' or "users"."customer_id" is not null)
);
--> statement-breakpoint
CREATE TABLE "visits" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"customer_id" uuid NOT NULL,
	"property_id" uuid NOT NULL,
	"agreement_id" uuid,
	"technician_id" uuid,
	"kind" text NOT NULL,
	"reason" text NOT NULL,
	"status" text NOT NULL,
	"window_start" timestamp with time zone NOT NULL,
	"window_end" timestamp with time zone NOT NULL,
	"starts_at" timestamp with time zone NOT NULL,
	"ends_at" timestamp with time zone NOT NULL,
	"symptoms" text[] DEFAULT '{}' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"findings" text DEFAULT '' NOT NULL,
	"recommendations" text DEFAULT '' NOT NULL,
	"completed_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "visits_kind" CHECK (kind in ('tune_up', 'service_call')),
	CONSTRAINT "visits_reason" CHECK (reason in ('no_cooling', 'no_heat', 'tune_up', 'noise', 'water_leak', 'thermostat', 'other')),
	CONSTRAINT "visits_status" CHECK (status in ('requested', 'scheduled', 'on_the_way', 'on_site', 'done', 'canceled', 'no_show')),
	CONSTRAINT "visits_window" CHECK ("visits"."window_end" > "visits"."window_start"),
	CONSTRAINT "visits_work" CHECK ("visits"."ends_at" > "visits"."starts_at")
);
--> statement-breakpoint
ALTER TABLE "customers" ADD CONSTRAINT "customers_merged_into_id_customers_id_fk" FOREIGN KEY ("merged_into_id") REFERENCES "public"."customers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "properties" ADD CONSTRAINT "properties_customer_id_customers_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "equipment" ADD CONSTRAINT "equipment_property_id_properties_id_fk" FOREIGN KEY ("property_id") REFERENCES "public"."properties"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "agreements" ADD CONSTRAINT "agreements_customer_id_customers_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "agreements" ADD CONSTRAINT "agreements_property_id_properties_id_fk" FOREIGN KEY ("property_id") REFERENCES "public"."properties"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "agreements" ADD CONSTRAINT "agreements_plan_version_id_plan_versions_id_fk" FOREIGN KEY ("plan_version_id") REFERENCES "public"."plan_versions"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plan_versions" ADD CONSTRAINT "plan_versions_plan_id_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."plans"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "technicians" ADD CONSTRAINT "technicians_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "users" ADD CONSTRAINT "users_customer_id_customers_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_customer_id_customers_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_property_id_properties_id_fk" FOREIGN KEY ("property_id") REFERENCES "public"."properties"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_agreement_id_agreements_id_fk" FOREIGN KEY ("agreement_id") REFERENCES "public"."agreements"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_technician_id_technicians_id_fk" FOREIGN KEY ("technician_id") REFERENCES "public"."technicians"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "customers_email_idx" ON "customers" USING btree (lower("email"));--> statement-breakpoint
CREATE INDEX "customers_name_idx" ON "customers" USING btree ("name");--> statement-breakpoint
CREATE INDEX "properties_customer_idx" ON "properties" USING btree ("customer_id");--> statement-breakpoint
CREATE INDEX "equipment_property_idx" ON "equipment" USING btree ("property_id");--> statement-breakpoint
CREATE INDEX "agreements_customer_idx" ON "agreements" USING btree ("customer_id");--> statement-breakpoint
CREATE INDEX "agreements_property_idx" ON "agreements" USING btree ("property_id");--> statement-breakpoint
CREATE INDEX "agreements_ends_on_idx" ON "agreements" USING btree ("ends_on","status");--> statement-breakpoint
CREATE UNIQUE INDEX "plan_versions_plan_version_key" ON "plan_versions" USING btree ("plan_id","version");--> statement-breakpoint
CREATE UNIQUE INDEX "plans_code_key" ON "plans" USING btree ("code");--> statement-breakpoint
CREATE UNIQUE INDEX "technicians_user_key" ON "technicians" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_key" ON "users" USING btree ("email");--> statement-breakpoint
CREATE INDEX "users_customer_idx" ON "users" USING btree ("customer_id");--> statement-breakpoint
CREATE INDEX "visits_technician_starts_idx" ON "visits" USING btree ("technician_id","starts_at");--> statement-breakpoint
CREATE INDEX "visits_property_idx" ON "visits" USING btree ("property_id");--> statement-breakpoint
CREATE INDEX "visits_customer_idx" ON "visits" USING btree ("customer_id");--> statement-breakpoint
CREATE INDEX "visits_starts_idx" ON "visits" USING btree ("starts_at");