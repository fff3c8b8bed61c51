ALTER TABLE "visits" ADD COLUMN "skipped_reason" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "visits" ADD COLUMN "repair_done" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "visits" ADD COLUMN "signature_image" text;--> statement-breakpoint
ALTER TABLE "visits" ADD COLUMN "signed_by" text;--> statement-breakpoint
ALTER TABLE "visits" ADD COLUMN "signed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_repair_signed" CHECK (not "repair_done" or ("signature_image" is not null and "signed_by" is not null and "signed_at" is not null));
