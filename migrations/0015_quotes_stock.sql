CREATE TABLE "flat_rate_task_lines" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"task_id" uuid NOT NULL,
	"item_id" uuid NOT NULL,
	"position" smallint NOT NULL,
	"quantity" numeric(12, 3) NOT NULL,
	CONSTRAINT "flat_rate_task_lines_quantity" CHECK ("flat_rate_task_lines"."quantity" > 0)
);
--> statement-breakpoint
CREATE TABLE "flat_rate_tasks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"sku" text NOT NULL,
	"name" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "price_book_item_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"item_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"sku" text NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"category" text NOT NULL,
	"unit" text NOT NULL,
	"unit_cents" integer NOT NULL,
	"cost_cents" integer NOT NULL,
	"taxable" boolean NOT NULL,
	"parts_warranty_months" smallint NOT NULL,
	"spec" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "price_book_items" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"sku" text NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"category" text NOT NULL,
	"unit" text DEFAULT 'each' NOT NULL,
	"unit_cents" integer NOT NULL,
	"cost_cents" integer DEFAULT 0 NOT NULL,
	"taxable" boolean NOT NULL,
	"parts_warranty_months" smallint DEFAULT 0 NOT NULL,
	"spec" jsonb,
	"active" boolean DEFAULT true NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"current_version_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "price_book_items_kind" CHECK (kind in ('part', 'labor', 'fee')),
	CONSTRAINT "price_book_items_category" CHECK (category in ('motor', 'capacitor', 'contactor', 'filter', 'refrigerant', 'control_board', 'igniter', 'flame_sensor', 'gas_valve', 'pressure_switch', 'relay', 'thermostat', 'coil', 'metering_device', 'compressor', 'consumable', 'other_part', 'repair_labor', 'maintenance_labor', 'install_labor', 'diagnostic_fee', 'tune_up', 'trip_fee', 'after_hours', 'permit', 'disposal', 'other_fee')),
	CONSTRAINT "price_book_items_unit" CHECK (unit in ('each', 'hour', 'lb', 'ft')),
	CONSTRAINT "price_book_items_cents" CHECK ("price_book_items"."unit_cents" >= 0 and "price_book_items"."unit_cents" <= 99999999 and "price_book_items"."cost_cents" >= 0 and "price_book_items"."cost_cents" <= 99999999),
	CONSTRAINT "price_book_items_warranty" CHECK ("price_book_items"."parts_warranty_months" >= 0 and "price_book_items"."parts_warranty_months" <= 240)
);
--> statement-breakpoint
CREATE TABLE "stock_levels" (
	"location_id" uuid NOT NULL,
	"item_id" uuid NOT NULL,
	"quantity" integer DEFAULT 0 NOT NULL,
	"minimum" integer DEFAULT 0 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "stock_levels_location_id_item_id_pk" PRIMARY KEY("location_id","item_id"),
	CONSTRAINT "stock_levels_quantity" CHECK ("stock_levels"."quantity" >= 0),
	CONSTRAINT "stock_levels_minimum" CHECK ("stock_levels"."minimum" >= 0)
);
--> statement-breakpoint
CREATE TABLE "stock_locations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"name" text NOT NULL,
	"technician_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "stock_locations_kind" CHECK (kind in ('truck', 'shop')),
	CONSTRAINT "stock_locations_truck_has_technician" CHECK (("stock_locations"."kind" = 'truck') = ("stock_locations"."technician_id" is not null))
);
--> statement-breakpoint
CREATE TABLE "stock_movements" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"location_id" uuid NOT NULL,
	"item_id" uuid NOT NULL,
	"quantity" integer NOT NULL,
	"visit_id" uuid,
	"quote_id" uuid,
	"transfer_id" uuid,
	"user_id" uuid,
	"note" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "stock_movements_kind" CHECK (kind in ('use', 'restock', 'transfer_out', 'transfer_in', 'count')),
	CONSTRAINT "stock_movements_quantity" CHECK ("stock_movements"."quantity" <> 0)
);
--> statement-breakpoint
CREATE TABLE "quote_approvals" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"quote_id" uuid NOT NULL,
	"revision" integer NOT NULL,
	"outcome" text NOT NULL,
	"option_id" uuid,
	"typed_name" text,
	"decline_reason" text,
	"ip" text NOT NULL,
	"on_device" text NOT NULL,
	"user_id" uuid,
	"at" timestamp with time zone NOT NULL,
	CONSTRAINT "quote_approvals_outcome" CHECK (("quote_approvals"."outcome" = 'approved' and "quote_approvals"."option_id" is not null and "quote_approvals"."typed_name" is not null) or ("quote_approvals"."outcome" = 'declined' and "quote_approvals"."decline_reason" is not null))
);
--> statement-breakpoint
CREATE TABLE "quote_lines" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"option_id" uuid NOT NULL,
	"position" smallint NOT NULL,
	"item_id" uuid,
	"item_version_id" uuid,
	"task_id" uuid,
	"group_key" text,
	"sku" text,
	"description" text NOT NULL,
	"kind" text NOT NULL,
	"category" text NOT NULL,
	"quantity" numeric(12, 3) NOT NULL,
	"unit_cents" integer NOT NULL,
	"taxable" boolean NOT NULL,
	"gross_cents" integer NOT NULL,
	"savings_cents" integer NOT NULL,
	"charged_cents" integer NOT NULL,
	"rules" text[] DEFAULT '{}' NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"stock_location_id" uuid,
	"equipment_id" uuid,
	CONSTRAINT "quote_lines_amounts" CHECK ("quote_lines"."quantity" > 0 and "quote_lines"."unit_cents" >= 0 and "quote_lines"."savings_cents" >= 0 and "quote_lines"."charged_cents" >= 0 and "quote_lines"."gross_cents" = "quote_lines"."savings_cents" + "quote_lines"."charged_cents")
);
--> statement-breakpoint
CREATE TABLE "quote_options" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"revision_id" uuid NOT NULL,
	"position" smallint NOT NULL,
	"title" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"subtotal_cents" integer NOT NULL,
	"savings_cents" integer NOT NULL,
	"taxable_cents" integer NOT NULL,
	"tax_cents" integer NOT NULL,
	"total_cents" integer NOT NULL,
	CONSTRAINT "quote_options_amounts" CHECK ("quote_options"."subtotal_cents" >= 0 and "quote_options"."savings_cents" >= 0 and "quote_options"."tax_cents" >= 0 and "quote_options"."total_cents" >= 0)
);
--> statement-breakpoint
CREATE TABLE "quote_revisions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"quote_id" uuid NOT NULL,
	"revision" integer NOT NULL,
	"status" text DEFAULT 'draft' NOT NULL,
	"equipment_id" uuid,
	"note" text DEFAULT '' NOT NULL,
	"photo_ids" text[] DEFAULT '{}' NOT NULL,
	"valid_days" smallint DEFAULT 30 NOT NULL,
	"tax_rate_bps" integer NOT NULL,
	"coverage_notes" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "quote_revisions_status" CHECK (status in ('draft', 'sent', 'approved', 'declined', 'expired'))
);
--> statement-breakpoint
CREATE TABLE "quotes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"number" integer GENERATED ALWAYS AS IDENTITY (sequence name "quotes_number_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 5001 CACHE 1),
	"visit_id" uuid NOT NULL,
	"customer_id" uuid NOT NULL,
	"property_id" uuid NOT NULL,
	"status" text DEFAULT 'draft' NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"valid_until" date,
	"sent_at" timestamp with time zone,
	"sent_to" text,
	"invoice_id" uuid,
	"follow_up_visit_id" uuid,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "quotes_status" CHECK (status in ('draft', 'sent', 'approved', 'declined', 'expired')),
	CONSTRAINT "quotes_revision" CHECK ("quotes"."revision" >= 1)
);
--> statement-breakpoint
ALTER TABLE "invoice_lines" ADD COLUMN "reason" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "flat_rate_task_lines" ADD CONSTRAINT "flat_rate_task_lines_task_id_flat_rate_tasks_id_fk" FOREIGN KEY ("task_id") REFERENCES "public"."flat_rate_tasks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flat_rate_task_lines" ADD CONSTRAINT "flat_rate_task_lines_item_id_price_book_items_id_fk" FOREIGN KEY ("item_id") REFERENCES "public"."price_book_items"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "price_book_item_versions" ADD CONSTRAINT "price_book_item_versions_item_id_price_book_items_id_fk" FOREIGN KEY ("item_id") REFERENCES "public"."price_book_items"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "price_book_items" ADD CONSTRAINT "price_book_items_current_version_id_price_book_item_versions_id_fk" FOREIGN KEY ("current_version_id") REFERENCES "public"."price_book_item_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_levels" ADD CONSTRAINT "stock_levels_location_id_stock_locations_id_fk" FOREIGN KEY ("location_id") REFERENCES "public"."stock_locations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_levels" ADD CONSTRAINT "stock_levels_item_id_price_book_items_id_fk" FOREIGN KEY ("item_id") REFERENCES "public"."price_book_items"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_locations" ADD CONSTRAINT "stock_locations_technician_id_technicians_id_fk" FOREIGN KEY ("technician_id") REFERENCES "public"."technicians"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_movements" ADD CONSTRAINT "stock_movements_location_id_stock_locations_id_fk" FOREIGN KEY ("location_id") REFERENCES "public"."stock_locations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_movements" ADD CONSTRAINT "stock_movements_item_id_price_book_items_id_fk" FOREIGN KEY ("item_id") REFERENCES "public"."price_book_items"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_movements" ADD CONSTRAINT "stock_movements_visit_id_visits_id_fk" FOREIGN KEY ("visit_id") REFERENCES "public"."visits"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_movements" ADD CONSTRAINT "stock_movements_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_approvals" ADD CONSTRAINT "quote_approvals_quote_id_quotes_id_fk" FOREIGN KEY ("quote_id") REFERENCES "public"."quotes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_approvals" ADD CONSTRAINT "quote_approvals_option_id_quote_options_id_fk" FOREIGN KEY ("option_id") REFERENCES "public"."quote_options"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_approvals" ADD CONSTRAINT "quote_approvals_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_lines" ADD CONSTRAINT "quote_lines_option_id_quote_options_id_fk" FOREIGN KEY ("option_id") REFERENCES "public"."quote_options"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_lines" ADD CONSTRAINT "quote_lines_item_id_price_book_items_id_fk" FOREIGN KEY ("item_id") REFERENCES "public"."price_book_items"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_lines" ADD CONSTRAINT "quote_lines_item_version_id_price_book_item_versions_id_fk" FOREIGN KEY ("item_version_id") REFERENCES "public"."price_book_item_versions"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_lines" ADD CONSTRAINT "quote_lines_task_id_flat_rate_tasks_id_fk" FOREIGN KEY ("task_id") REFERENCES "public"."flat_rate_tasks"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_lines" ADD CONSTRAINT "quote_lines_stock_location_id_stock_locations_id_fk" FOREIGN KEY ("stock_location_id") REFERENCES "public"."stock_locations"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_lines" ADD CONSTRAINT "quote_lines_equipment_id_equipment_id_fk" FOREIGN KEY ("equipment_id") REFERENCES "public"."equipment"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_options" ADD CONSTRAINT "quote_options_revision_id_quote_revisions_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."quote_revisions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_revisions" ADD CONSTRAINT "quote_revisions_quote_id_quotes_id_fk" FOREIGN KEY ("quote_id") REFERENCES "public"."quotes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_revisions" ADD CONSTRAINT "quote_revisions_equipment_id_equipment_id_fk" FOREIGN KEY ("equipment_id") REFERENCES "public"."equipment"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_revisions" ADD CONSTRAINT "quote_revisions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_visit_id_visits_id_fk" FOREIGN KEY ("visit_id") REFERENCES "public"."visits"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_customer_id_customers_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_property_id_properties_id_fk" FOREIGN KEY ("property_id") REFERENCES "public"."properties"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_invoice_id_invoices_id_fk" FOREIGN KEY ("invoice_id") REFERENCES "public"."invoices"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_follow_up_visit_id_visits_id_fk" FOREIGN KEY ("follow_up_visit_id") REFERENCES "public"."visits"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "flat_rate_task_lines_item_key" ON "flat_rate_task_lines" USING btree ("task_id","item_id");--> statement-breakpoint
CREATE UNIQUE INDEX "flat_rate_tasks_sku_key" ON "flat_rate_tasks" USING btree ("sku");--> statement-breakpoint
CREATE UNIQUE INDEX "price_book_item_versions_key" ON "price_book_item_versions" USING btree ("item_id","version");--> statement-breakpoint
CREATE UNIQUE INDEX "price_book_items_sku_key" ON "price_book_items" USING btree ("sku");--> statement-breakpoint
CREATE INDEX "price_book_items_category_idx" ON "price_book_items" USING btree ("category");--> statement-breakpoint
CREATE INDEX "stock_levels_item_idx" ON "stock_levels" USING btree ("item_id");--> statement-breakpoint
CREATE UNIQUE INDEX "stock_locations_technician_key" ON "stock_locations" USING btree ("technician_id");--> statement-breakpoint
CREATE UNIQUE INDEX "stock_locations_name_key" ON "stock_locations" USING btree ("name");--> statement-breakpoint
CREATE INDEX "stock_movements_location_idx" ON "stock_movements" USING btree ("location_id","created_at");--> statement-breakpoint
CREATE INDEX "stock_movements_visit_idx" ON "stock_movements" USING btree ("visit_id");--> statement-breakpoint
CREATE UNIQUE INDEX "quote_approvals_revision_key" ON "quote_approvals" USING btree ("quote_id","revision");--> statement-breakpoint
CREATE UNIQUE INDEX "quote_lines_position_key" ON "quote_lines" USING btree ("option_id","position");--> statement-breakpoint
CREATE UNIQUE INDEX "quote_options_position_key" ON "quote_options" USING btree ("revision_id","position");--> statement-breakpoint
CREATE UNIQUE INDEX "quote_revisions_key" ON "quote_revisions" USING btree ("quote_id","revision");--> statement-breakpoint
CREATE UNIQUE INDEX "quotes_number_key" ON "quotes" USING btree ("number");--> statement-breakpoint
CREATE INDEX "quotes_visit_idx" ON "quotes" USING btree ("visit_id");--> statement-breakpoint
CREATE INDEX "quotes_customer_idx" ON "quotes" USING btree ("customer_id");--> statement-breakpoint
CREATE INDEX "quotes_status_idx" ON "quotes" USING btree ("status","created_at");