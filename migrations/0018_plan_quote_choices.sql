ALTER TABLE "plan_versions" ADD COLUMN "discount_categories" text[] DEFAULT '{"motor","capacitor","contactor","control_board","igniter","flame_sensor","gas_valve","pressure_switch","relay","thermostat","coil","metering_device","compressor","other_part","repair_labor"}' NOT NULL;--> statement-breakpoint
ALTER TABLE "plan_versions" ADD COLUMN "warranty_labor_covered" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "invoices" ADD COLUMN "visit_id" uuid;--> statement-breakpoint
ALTER TABLE "invoices" ADD CONSTRAINT "invoices_visit_id_visits_id_fk" FOREIGN KEY ("visit_id") REFERENCES "public"."visits"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "invoices_visit_idx" ON "invoices" USING btree ("visit_id");