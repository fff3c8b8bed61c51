ALTER TABLE "equipment" DROP CONSTRAINT "equipment_refrigerant";--> statement-breakpoint
ALTER TABLE "company" ADD COLUMN "cooling_start_month" smallint DEFAULT 3 NOT NULL;--> statement-breakpoint
ALTER TABLE "company" ADD COLUMN "heating_start_month" smallint DEFAULT 9 NOT NULL;--> statement-breakpoint
ALTER TABLE "equipment" ADD COLUMN "compressor_type" text;--> statement-breakpoint
ALTER TABLE "equipment" ADD COLUMN "max_compressor_hz" double precision;--> statement-breakpoint
ALTER TABLE "equipment" ADD COLUMN "max_external_static_in_wc" double precision;--> statement-breakpoint
ALTER TABLE "company" ADD CONSTRAINT "company_season_months" CHECK ("company"."cooling_start_month" between 1 and 12 and "company"."heating_start_month" between 1 and 12 and "company"."cooling_start_month" <> "company"."heating_start_month");--> statement-breakpoint
ALTER TABLE "equipment" ADD CONSTRAINT "equipment_compressor_type" CHECK (compressor_type is null or compressor_type in ('fixed_speed', 'two_stage', 'variable_speed'));--> statement-breakpoint
ALTER TABLE "equipment" ADD CONSTRAINT "equipment_max_compressor_hz" CHECK ("equipment"."max_compressor_hz" is null or ("equipment"."max_compressor_hz" > 0 and "equipment"."max_compressor_hz" <= 300));--> statement-breakpoint
ALTER TABLE "equipment" ADD CONSTRAINT "equipment_max_static" CHECK ("equipment"."max_external_static_in_wc" is null or ("equipment"."max_external_static_in_wc" > 0 and "equipment"."max_external_static_in_wc" <= 2));--> statement-breakpoint
ALTER TABLE "equipment" ADD CONSTRAINT "equipment_refrigerant" CHECK (refrigerant is null or refrigerant in ('R-410A', 'R-22', 'R-32', 'R-454B', 'R-407C'));