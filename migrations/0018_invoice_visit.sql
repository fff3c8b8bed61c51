ALTER TABLE "invoices" ADD COLUMN "visit_id" uuid;--> statement-breakpoint
ALTER TABLE "invoices" ADD CONSTRAINT "invoices_visit_id_visits_id_fk" FOREIGN KEY ("visit_id") REFERENCES "public"."visits"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "invoices_visit_idx" ON "invoices" USING btree ("visit_id");--> statement-breakpoint
-- Hand-written: invoices issued from an approved quote take the quote's visit.
UPDATE "invoices" i SET "visit_id" = q."visit_id" FROM "quotes" q WHERE q."invoice_id" = i."id" AND i."visit_id" IS NULL;
