-- A job is billed on one invoice at a time (schema.ts, invoices_job_live_key); the API has always
-- refused a second one, so a database in use holds none. Should one hold two anyway, the upgrade
-- stops and says which, rather than choosing an invoice to void on the owner's behalf.
DO $$
DECLARE
  twice record;
BEGIN
  SELECT job_id, string_agg(number::text, ', ' ORDER BY number) AS numbers INTO twice
    FROM invoices WHERE status <> 'void' GROUP BY job_id HAVING count(*) > 1 ORDER BY job_id LIMIT 1;
  IF FOUND THEN
    RAISE EXCEPTION 'Job % is billed on more than one invoice that is not void (numbers %): void all but one, then start Vanbay again.', twice.job_id, twice.numbers;
  END IF;
END $$;--> statement-breakpoint
CREATE UNIQUE INDEX "invoices_job_live_key" ON "invoices" USING btree ("job_id") WHERE "invoices"."status" <> 'void';
