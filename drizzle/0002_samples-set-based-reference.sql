ALTER TABLE "samples" DROP CONSTRAINT "samples_flight_id_flights_id_fk";
--> statement-breakpoint
-- Written by hand (drizzle-kit does not model triggers). The reference from samples to flights,
-- kept as set-based checks: one anti-join per statement instead of one lookup per row.
CREATE FUNCTION samples_check_flight() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
	missing uuid;
BEGIN
	SELECT n.flight_id INTO missing FROM new_samples n LEFT JOIN flights f ON f.id = n.flight_id WHERE f.id IS NULL LIMIT 1;
	IF FOUND THEN
		RAISE EXCEPTION 'samples refer to flight % that does not exist', missing USING ERRCODE = 'foreign_key_violation';
	END IF;
	RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER samples_flight_exists_on_insert AFTER INSERT ON samples REFERENCING NEW TABLE AS new_samples FOR EACH STATEMENT EXECUTE FUNCTION samples_check_flight();
--> statement-breakpoint
CREATE TRIGGER samples_flight_exists_on_update AFTER UPDATE ON samples REFERENCING NEW TABLE AS new_samples FOR EACH STATEMENT EXECUTE FUNCTION samples_check_flight();
--> statement-breakpoint
CREATE FUNCTION flights_delete_samples() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	DELETE FROM samples s USING old_flights o WHERE s.flight_id = o.id;
	RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER flights_cascade_samples AFTER DELETE ON flights REFERENCING OLD TABLE AS old_flights FOR EACH STATEMENT EXECUTE FUNCTION flights_delete_samples();
--> statement-breakpoint
-- A flight's id never changes; refuse it rather than orphan its samples.
CREATE FUNCTION flights_keep_id() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	RAISE EXCEPTION 'a flight id cannot change' USING ERRCODE = 'foreign_key_violation';
END $$;
--> statement-breakpoint
CREATE TRIGGER flights_id_is_fixed BEFORE UPDATE OF id ON flights FOR EACH ROW WHEN (OLD.id IS DISTINCT FROM NEW.id) EXECUTE FUNCTION flights_keep_id();
