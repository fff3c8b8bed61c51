CREATE TABLE "mail_sends" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"key" text NOT NULL,
	"kind" text NOT NULL,
	"recipient" text NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"message" jsonb,
	"message_id" text,
	"claimed_at" timestamp with time zone,
	"sent_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "mail_sends_status" CHECK (status in ('queued', 'sending', 'retrying', 'sent', 'failed'))
);
--> statement-breakpoint
CREATE UNIQUE INDEX "mail_sends_key" ON "mail_sends" USING btree ("key");--> statement-breakpoint
CREATE INDEX "mail_sends_status_idx" ON "mail_sends" USING btree ("status","updated_at");