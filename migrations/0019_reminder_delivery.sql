ALTER TABLE "reminder_sends" ADD COLUMN "claim_token" uuid;--> statement-breakpoint
ALTER TABLE "reminder_sends" ADD COLUMN "smtp_reply" text;--> statement-breakpoint
CREATE INDEX "equipment_property_kind_live_idx" ON "equipment" USING btree ("property_id","kind") WHERE archived_at is null;--> statement-breakpoint
CREATE INDEX "agreements_customer_live_idx" ON "agreements" USING btree ("customer_id","ends_on","plan_version_id","property_id") WHERE status in ('active', 'renewal_due');--> statement-breakpoint
CREATE INDEX "visits_customer_done_idx" ON "visits" USING btree ("customer_id","starts_at","kind") WHERE status = 'done';--> statement-breakpoint
CREATE INDEX "visits_property_done_idx" ON "visits" USING btree ("property_id","starts_at") WHERE status = 'done';--> statement-breakpoint
CREATE INDEX "visits_tune_up_live_idx" ON "visits" USING btree ("starts_at","customer_id") WHERE kind = 'tune_up' and status not in ('canceled', 'no_show');--> statement-breakpoint
CREATE INDEX "reminder_sends_sent_idx" ON "reminder_sends" USING btree ("kind","sent_at","customer_id") WHERE status = 'sent';