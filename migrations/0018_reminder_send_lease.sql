ALTER TABLE "reminder_sends" ADD COLUMN "claim_token" uuid;--> statement-breakpoint
ALTER TABLE "reminder_sends" ADD COLUMN "smtp_reply" text;