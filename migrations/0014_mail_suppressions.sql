CREATE TABLE "mail_suppressions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"purpose" text NOT NULL,
	"customer_id" uuid,
	"source" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "mail_suppressions_purpose" CHECK ("mail_suppressions"."purpose" in ('reminders'))
);
--> statement-breakpoint
ALTER TABLE "mail_suppressions" ADD CONSTRAINT "mail_suppressions_customer_id_customers_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customers"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "mail_suppressions_email_purpose_key" ON "mail_suppressions" USING btree (lower("email"),"purpose");