ALTER TABLE "equipment" DROP CONSTRAINT "equipment_refrigerant";--> statement-breakpoint
ALTER TABLE "visits" ADD COLUMN "notice_signature" text;--> statement-breakpoint
ALTER TABLE "equipment" ADD CONSTRAINT "equipment_refrigerant" CHECK (refrigerant is null or refrigerant in ('R-410A', 'R-22', 'R-32', 'R-454B', 'R-407C'));