-- batch_outcomes is kept by triggers: a driver inserted counts in its batch; a driver's first
-- final test counts as tested, its first failure as failed. The driver row is locked first, so
-- two tests of one driver committed at once cannot both count as its first (under READ
-- COMMITTED each statement after the lock sees the other's committed row).
CREATE OR REPLACE FUNCTION batch_outcomes_count_driver() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO batch_outcomes (batch_id, drivers) VALUES (NEW.batch_id, 1)
  ON CONFLICT (batch_id) DO UPDATE SET drivers = batch_outcomes.drivers + 1;
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER drivers_count_batch_outcomes AFTER INSERT ON drivers
  FOR EACH ROW EXECUTE FUNCTION batch_outcomes_count_driver();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION batch_outcomes_count_test() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  b uuid;
  first_test boolean;
  first_fail boolean;
BEGIN
  SELECT batch_id INTO b FROM drivers WHERE id = NEW.driver_id FOR NO KEY UPDATE;
  first_test := NOT EXISTS (SELECT 1 FROM test_results t WHERE t.driver_id = NEW.driver_id AND t.id <> NEW.id);
  first_fail := NEW.result = 'fail' AND NOT EXISTS (
    SELECT 1 FROM test_results t WHERE t.driver_id = NEW.driver_id AND t.id <> NEW.id AND t.result = 'fail');
  IF first_test OR first_fail THEN
    INSERT INTO batch_outcomes (batch_id, tested, failed) VALUES (b, first_test::int, first_fail::int)
    ON CONFLICT (batch_id) DO UPDATE SET tested = batch_outcomes.tested + EXCLUDED.tested, failed = batch_outcomes.failed + EXCLUDED.failed;
  END IF;
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER test_results_count_batch_outcomes AFTER INSERT ON test_results
  FOR EACH ROW EXECUTE FUNCTION batch_outcomes_count_test();
--> statement-breakpoint
-- Test results and drivers are never updated in what the counts read (driver, result) nor deleted.
CREATE OR REPLACE FUNCTION batch_outcomes_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% of %.% would leave batch_outcomes wrong', TG_OP, TG_TABLE_NAME, TG_ARGV[0] USING ERRCODE = 'feature_not_supported';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER test_results_outcome_fixed BEFORE UPDATE OF driver_id, result ON test_results
  FOR EACH ROW WHEN (OLD.driver_id IS DISTINCT FROM NEW.driver_id OR OLD.result IS DISTINCT FROM NEW.result)
  EXECUTE FUNCTION batch_outcomes_refuse_change('driver_id/result');
--> statement-breakpoint
CREATE TRIGGER drivers_batch_fixed BEFORE UPDATE OF batch_id ON drivers
  FOR EACH ROW WHEN (OLD.batch_id IS DISTINCT FROM NEW.batch_id)
  EXECUTE FUNCTION batch_outcomes_refuse_change('batch_id');
--> statement-breakpoint
-- What is there already.
INSERT INTO batch_outcomes (batch_id, drivers, tested, failed)
SELECT d.batch_id, count(*)::int, count(t.driver_id)::int, (count(*) FILTER (WHERE t.failed))::int
FROM drivers d
LEFT JOIN (SELECT driver_id, bool_or(result = 'fail') AS failed FROM test_results GROUP BY driver_id) t ON t.driver_id = d.id
GROUP BY d.batch_id;
