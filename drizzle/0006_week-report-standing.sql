ALTER TABLE "service_intervals" ADD COLUMN "judged_by" text;--> statement-breakpoint
ALTER TABLE "service_intervals" ADD COLUMN "due_soon_on" date;--> statement-breakpoint
ALTER TABLE "service_intervals" ADD COLUMN "meter_due_since" timestamp with time zone;--> statement-breakpoint
CREATE INDEX "service_intervals_business_due_soon_idx" ON "service_intervals" USING btree ("business_id","due_soon_on");--> statement-breakpoint
CREATE INDEX "service_intervals_business_meter_due_idx" ON "service_intervals" USING btree ("business_id","meter_due_since","due_soon_on");--> statement-breakpoint
CREATE INDEX "service_intervals_business_evaluator_idx" ON "service_intervals" USING btree ("business_id") WHERE "service_intervals"."judged_by" = 'evaluator';--> statement-breakpoint
ALTER TABLE "service_intervals" ADD CONSTRAINT "service_intervals_judged_by_check" CHECK ("service_intervals"."judged_by" in ('database', 'evaluator'));--> statement-breakpoint
-- Where each service interval stands (schema.ts, service_intervals.judged_by): the shared
-- evaluator's rules (shared/evaluators/service-interval.ts statusFor) as far as they do not depend
-- on the day the week report is read for. Due soon or worse by months: days left ≤ 30 or ≤ a tenth
-- of the interval's days, so from the due date less the larger of 30 and a tenth of the interval's
-- days (whole days: 10 × days ≤ greatest(300, interval days)). By the meter: at most the last tenth
-- of the interval left (a mile limit is stored in km; 1 mi = 1.609 344 km, NIST SP 811). A value
-- the evaluator refuses (a limit not positive or not finite, a meter negative or not finite;
-- 'Infinity' sorts below NaN), or a meter within a millionth of a limit or of its last tenth, is
-- left to the evaluator.
CREATE FUNCTION "service_interval_standing"() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  machine record;
  meter_every float8;
  meter_left float8;
  due date;
BEGIN
  NEW.judged_by := NULL;
  NEW.due_soon_on := NULL;
  NEW.meter_due_since := NULL;
  SELECT m.meter_unit, m.meter_reading, m.meter_read_at, m.archived_at INTO machine
    FROM machines m WHERE m.id = NEW.machine_id;
  IF NOT FOUND OR machine.archived_at IS NOT NULL OR NEW.last_done_on IS NULL THEN
    RETURN NEW;
  END IF;
  IF coalesce(least(NEW.every_km, NEW.every_hours, NEW.every_months) <= 0
      OR least(NEW.last_done_meter, machine.meter_reading) < 0
      OR greatest(NEW.every_km, NEW.every_hours, NEW.last_done_meter, machine.meter_reading) >= 'Infinity'::float8,
      false) THEN
    NEW.judged_by := 'evaluator';
    RETURN NEW;
  END IF;
  meter_every := CASE machine.meter_unit WHEN 'h' THEN NEW.every_hours WHEN 'km' THEN NEW.every_km
    ELSE NEW.every_km / 1.609344::float8 END;
  meter_left := NEW.last_done_meter + meter_every - machine.meter_reading;
  IF least(abs(meter_left), abs(meter_left - meter_every * 0.1::float8))
      <= 1e-6::float8 * greatest(1::float8, machine.meter_reading, NEW.last_done_meter + meter_every) THEN
    NEW.judged_by := 'evaluator';
    RETURN NEW;
  END IF;
  NEW.judged_by := 'database';
  due := (NEW.last_done_on + NEW.every_months * interval '1 month')::date;
  NEW.due_soon_on := due - greatest(300, due - NEW.last_done_on) / 10;
  IF meter_left <= meter_every * 0.1::float8 THEN
    NEW.meter_due_since := coalesce(machine.meter_read_at, '-infinity'::timestamptz);
  END IF;
  RETURN NEW;
END
$$;
--> statement-breakpoint
CREATE TRIGGER "service_intervals_standing" BEFORE INSERT OR UPDATE ON "service_intervals"
  FOR EACH ROW EXECUTE FUNCTION "service_interval_standing"();
--> statement-breakpoint
-- A machine's new meter, unit or archiving moves where its intervals stand: touching them runs the
-- trigger above again.
CREATE FUNCTION "machine_intervals_restand"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE service_intervals SET judged_by = NULL WHERE machine_id = NEW.id;
  RETURN NULL;
END
$$;
--> statement-breakpoint
CREATE TRIGGER "machines_intervals_restand" AFTER UPDATE OF meter_unit, meter_reading, meter_read_at, archived_at
  ON "machines" FOR EACH ROW
  WHEN (OLD.meter_unit IS DISTINCT FROM NEW.meter_unit OR OLD.meter_reading IS DISTINCT FROM NEW.meter_reading
    OR OLD.meter_read_at IS DISTINCT FROM NEW.meter_read_at OR OLD.archived_at IS DISTINCT FROM NEW.archived_at)
  EXECUTE FUNCTION "machine_intervals_restand"();
--> statement-breakpoint
-- Every interval written again, so the trigger works out where it stands. PGlite's next start
-- vacuums and analyzes the table, rewritten here (server/db/migrate.ts); PostgreSQL's autovacuum.
UPDATE "service_intervals" SET "judged_by" = NULL;
