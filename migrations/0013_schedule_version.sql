CREATE TABLE "schedule_version" (
	"id" smallint PRIMARY KEY DEFAULT 1 NOT NULL,
	"version" bigint DEFAULT 0 NOT NULL,
	CONSTRAINT "schedule_version_single_row" CHECK ("schedule_version"."id" = 1)
);--> statement-breakpoint
INSERT INTO "schedule_version" ("id", "version") VALUES (1, 0) ON CONFLICT DO NOTHING;--> statement-breakpoint
CREATE FUNCTION bump_schedule_version() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE schedule_version SET version = version + 1 WHERE id = 1;
  RETURN NULL;
END $$;--> statement-breakpoint
CREATE TRIGGER visits_schedule_version AFTER INSERT OR DELETE OR UPDATE OF technician_id, status, starts_at, ends_at, priority ON visits
  FOR EACH STATEMENT EXECUTE FUNCTION bump_schedule_version();--> statement-breakpoint
CREATE TRIGGER technicians_schedule_version AFTER INSERT OR UPDATE OR DELETE ON technicians
  FOR EACH STATEMENT EXECUTE FUNCTION bump_schedule_version();--> statement-breakpoint
CREATE TRIGGER technician_time_off_schedule_version AFTER INSERT OR UPDATE OR DELETE ON technician_time_off
  FOR EACH STATEMENT EXECUTE FUNCTION bump_schedule_version();--> statement-breakpoint
CREATE TRIGGER booking_settings_schedule_version AFTER INSERT OR UPDATE OR DELETE ON booking_settings
  FOR EACH STATEMENT EXECUTE FUNCTION bump_schedule_version();--> statement-breakpoint
CREATE TRIGGER company_schedule_version AFTER INSERT OR UPDATE OR DELETE ON company
  FOR EACH STATEMENT EXECUTE FUNCTION bump_schedule_version();--> statement-breakpoint
CREATE TRIGGER users_schedule_version AFTER UPDATE OF disabled_at, name ON users
  FOR EACH STATEMENT EXECUTE FUNCTION bump_schedule_version();
