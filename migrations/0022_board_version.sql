CREATE TABLE "board_version" (
	"id" smallint PRIMARY KEY DEFAULT 1 NOT NULL,
	"version" bigint DEFAULT 0 NOT NULL,
	CONSTRAINT "board_version_single_row" CHECK ("board_version"."id" = 1)
);--> statement-breakpoint
INSERT INTO "board_version" ("id", "version") VALUES (1, 0) ON CONFLICT DO NOTHING;--> statement-breakpoint
-- The dispatch board's version. Bumped once per transaction, at its commit (deferred constraint
-- triggers), by every write the board shows: a process may keep a board it built while the version
-- it read stays the same. Taken only at commit, the row lock is held by a transaction that has no
-- statement left to wait on, so it cannot close a deadlock with the rows the transaction wrote.
CREATE FUNCTION bump_board_version() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF coalesce(current_setting('seasonwell.board_bumped', true), '') <> 'on' THEN
    UPDATE board_version SET version = version + 1 WHERE id = 1;
    PERFORM set_config('seasonwell.board_bumped', 'on', true);
  END IF;
  RETURN NULL;
END $$;--> statement-breakpoint
CREATE CONSTRAINT TRIGGER visits_board_version AFTER INSERT OR DELETE OR UPDATE OF
    kind, reason, status, window_start, window_end, starts_at, ends_at, technician_id, priority, symptoms, notes, sequence, customer_id, property_id
  ON visits DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();--> statement-breakpoint
CREATE CONSTRAINT TRIGGER customers_board_version AFTER INSERT OR DELETE OR UPDATE OF name, email
  ON customers DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();--> statement-breakpoint
CREATE CONSTRAINT TRIGGER properties_board_version AFTER INSERT OR DELETE OR UPDATE OF customer_id, street, unit, city, state, zip, area
  ON properties DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();--> statement-breakpoint
CREATE CONSTRAINT TRIGGER agreements_board_version AFTER INSERT OR DELETE OR UPDATE OF property_id, plan_version_id, status, ends_on
  ON agreements DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();--> statement-breakpoint
CREATE CONSTRAINT TRIGGER plan_versions_board_version AFTER INSERT OR DELETE OR UPDATE OF plan_id
  ON plan_versions DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();--> statement-breakpoint
CREATE CONSTRAINT TRIGGER plans_board_version AFTER INSERT OR DELETE OR UPDATE OF name
  ON plans DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();--> statement-breakpoint
CREATE CONSTRAINT TRIGGER technicians_board_version AFTER INSERT OR DELETE OR UPDATE
  ON technicians DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();--> statement-breakpoint
CREATE CONSTRAINT TRIGGER users_board_version AFTER UPDATE OF name
  ON users DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();--> statement-breakpoint
CREATE CONSTRAINT TRIGGER technician_time_off_board_version AFTER INSERT OR DELETE OR UPDATE
  ON technician_time_off DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();--> statement-breakpoint
CREATE CONSTRAINT TRIGGER company_board_version AFTER INSERT OR DELETE OR UPDATE
  ON company DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();--> statement-breakpoint
CREATE CONSTRAINT TRIGGER booking_settings_board_version AFTER INSERT OR DELETE OR UPDATE
  ON booking_settings DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_board_version();
