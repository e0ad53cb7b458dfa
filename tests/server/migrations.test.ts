import { cpSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { getTableConfig, PgTable } from 'drizzle-orm/pg-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { queryRows, type Database, type Schema } from '../../server/db/client';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import { migrate as migratePg } from 'drizzle-orm/node-postgres/migrator';
import type { PgliteDatabase } from 'drizzle-orm/pglite';
import type { NodePgDatabase } from 'drizzle-orm/node-postgres';
import { migrate, MIGRATIONS_FOLDER } from '../../server/db/migrate';
import * as schema from '../../server/db/schema';
import { blankDatabase } from '../helpers/db';

const tables = (Object.values(schema) as unknown[])
  .filter((value): value is PgTable => value instanceof PgTable)
  .map((table) => getTableConfig(table));

describe('migrations on an empty database', () => {
  let database: Database;
  beforeAll(async () => {
    database = await blankDatabase();
    await migrate(database);
  });
  afterAll(() => database.close());

  it('create every table and column the schema declares', async () => {
    const columns = await queryRows<{ table_name: string; column_name: string }>(
      database.db,
      sql`select table_name, column_name from information_schema.columns where table_schema = 'public'`,
    );
    const actual = new Set(columns.map((row) => `${row.table_name}.${row.column_name}`));
    // The schema names columns in camelCase; drizzle's `casing: 'snake_case'` maps them in SQL.
    const snake = (name: string) => name.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);
    const expected = tables.flatMap((table) =>
      table.columns.map((column) => `${table.name}.${snake(column.name)}`),
    );
    expect(expected.length).toBeGreaterThan(150);
    expect(expected.filter((name) => !actual.has(name))).toEqual([]);
  });

  it('give every business-owned table a business_id foreign key', () => {
    const global = new Set(['businesses']);
    const missing = tables
      .filter((table) => !global.has(table.name))
      .filter((table) => !table.foreignKeys.some((fk) => fk.reference().foreignTable === schema.businesses))
      .map((table) => table.name);
    expect(missing).toEqual([]);
  });

  it('record each migration of the journal once, and a second run changes nothing', async () => {
    const journal = JSON.parse(
      readFileSync(path.join(MIGRATIONS_FOLDER, 'meta', '_journal.json'), 'utf8'),
    ) as {
      entries: unknown[];
    };
    const count = async () =>
      (
        await queryRows<{ n: number }>(
          database.db,
          sql`select count(*)::int as n from drizzle.__drizzle_migrations`,
        )
      )[0]!.n;
    expect(await count()).toBe(journal.entries.length);
    await migrate(database);
    expect(await count()).toBe(journal.entries.length);
  });

  it('refuse an invoice whose balance is not total − paid', async () => {
    const insert = database.db.execute(sql`
      insert into invoices (business_id, number, job_id, customer_id, issued_on, due_on, subtotal_cents,
                            tax_cents, total_cents, paid_cents, balance_cents, tax_rate_ppm, tax_rounding)
      values (1, 1, 1, 1, '2026-01-01', '2026-01-15', 100, 0, 100, 0, 99, 0, 'per_invoice')`);
    const error = await insert.then(
      () => null,
      (e: Error & { cause?: Error }) => e,
    );
    expect(String(error?.cause?.message ?? error?.message)).toMatch(/invoices_balance_check/);
  });

  it('refuse an estimate marked approved with no decision time, or one decided while still sent', async () => {
    const attempt = (status: string, decidedAt: string | null) =>
      database.db
        .execute(
          sql`insert into estimates (business_id, job_id, status, total_cents, lines, decided_at)
              values (1, 1, ${status}::estimate_status, 100, '[]'::jsonb, ${decidedAt}::timestamptz)`,
        )
        .then(
          () => null,
          (e: Error & { cause?: Error }) => String(e.cause?.message ?? e.message),
        );
    // The empty database has no business 1 or job 1: the check is met first because PostgreSQL
    // tests CHECK constraints on the row before its foreign-key triggers run (from memory).
    expect(await attempt('approved', null)).toMatch(/estimates_decision_check/);
    expect(await attempt('sent', '2026-11-18T15:00:00Z')).toMatch(/estimates_decision_check/);
  });
});

describe('an upgrade of a database in use', () => {
  let database: Database;
  beforeAll(async () => {
    database = await blankDatabase();
  });
  afterAll(() => database.close());

  /** Applies the journal's migrations up to and including `tag`, as a database made before the rest. */
  async function migrateUpTo(tag: string) {
    const journal = JSON.parse(
      readFileSync(path.join(MIGRATIONS_FOLDER, 'meta', '_journal.json'), 'utf8'),
    ) as {
      entries: { tag: string }[];
    };
    const upTo = journal.entries.findIndex((entry) => entry.tag === tag);
    expect(upTo).toBeGreaterThan(0);
    const folder = mkdtempSync(path.join(tmpdir(), 'vanbay-migrations-'));
    cpSync(MIGRATIONS_FOLDER, folder, { recursive: true });
    writeFileSync(
      path.join(folder, 'meta', '_journal.json'),
      JSON.stringify({ ...journal, entries: journal.entries.slice(0, upTo + 1) }),
    );
    const config = { migrationsFolder: folder };
    if (database.engine === 'pglite') await migratePglite(database.db as PgliteDatabase<Schema>, config);
    else await migratePg(database.db as NodePgDatabase<Schema>, config);
  }

  it('stops at a job billed on two live invoices (0007), says which, and applies nothing', async () => {
    await migrateUpTo('0005_week-report-months-due');
    await database.db.execute(sql`
      insert into businesses (id, owner_name, labour_rate_cents, name, email, slug)
        overriding system value values (2, 'Owner', 9000, 'Other shop', 'other@example.test', 'other')`);
    await database.db.execute(sql`
      insert into customers (id, business_id, name) overriding system value values (2, 2, 'Customer')`);
    await database.db.execute(sql`
      insert into machines (id, business_id, customer_id, kind, make, model, meter_unit)
        overriding system value values (3, 2, 2, 'atv', 'Tamarack', 'Billed 450', 'h')`);
    await database.db.execute(sql`
      insert into jobs (id, business_id, customer_id, machine_id, complaint, status)
        overriding system value values (1, 2, 2, 3, 'Hard start', 'complete'), (2, 2, 2, 3, 'No idle', 'complete')`);
    // Job 2 billed twice: once void, once live (as voiding and billing again leaves it); job 1 twice live.
    const invoice = (number: number, job: number, status: string) => sql`
      insert into invoices (business_id, number, job_id, customer_id, status, issued_on, due_on, subtotal_cents,
          tax_cents, total_cents, paid_cents, balance_cents, tax_rate_ppm, tax_rounding)
        values (2, ${number}, ${job}, 2, ${status}, '2026-11-18', '2026-12-02', 1000, 0, 1000, 0, 1000, 0, 'per_invoice')`;
    await database.db.execute(invoice(1, 2, 'void'));
    await database.db.execute(invoice(2, 2, 'issued'));
    await database.db.execute(invoice(3, 1, 'issued'));
    await database.db.execute(invoice(4, 1, 'issued'));

    await expect(migrate(database)).rejects.toThrow(
      /^Job 1 is billed on more than one invoice that is not void \(numbers 3, 4\): void all but one, then start Vanbay again\.$/,
    );
    // The upgrade is one transaction: not even 0006 (before the refusal) stayed.
    const standing = await queryRows<{ n: number }>(
      database.db,
      sql`select count(*)::int as n from information_schema.columns where table_name = 'service_intervals' and column_name = 'judged_by'`,
    );
    expect(standing[0]!.n).toBe(0);

    // As the owner would: void one, and the next start upgrades.
    await database.db.execute(sql`update invoices set status = 'void' where number = 4 and business_id = 2`);
  });

  it('works out where each service interval already stored stands (0006), and vacuums a PGlite database', async () => {
    await migrateUpTo('0005_week-report-months-due');
    await database.db.execute(sql`
      insert into businesses (id, owner_name, labour_rate_cents, name, email, slug)
        overriding system value values (1, 'Owner', 9000, 'Shop', 'shop@example.test', 'shop')`);
    await database.db.execute(sql`
      insert into customers (id, business_id, name) overriding system value values (1, 1, 'Customer')`);
    // An hour meter at 95 h read on 2026-11-18, and an archived machine.
    await database.db.execute(sql`
      insert into machines (id, business_id, customer_id, kind, make, model, meter_unit, meter_reading, meter_read_at, archived_at)
        overriding system value values
        (1, 1, 1, 'atv', 'Tamarack', 'Meter 450', 'h', 95, '2026-11-18T15:00:00Z', null),
        (2, 1, 1, 'atv', 'Tamarack', 'Sold 450', 'h', 10, null, '2026-06-01T00:00:00Z')`);
    await database.db.execute(sql`
      insert into service_intervals (business_id, machine_id, item, label, every_hours, every_months, last_done_on, last_done_meter)
      values
        -- 100 h or 12 months from 0 h on 2026-06-01: 5 h left, the last tenth, due by the meter;
        -- the months limit (365 days) due soon from 36 days before 2027-06-01, 2027-04-26.
        (1, 1, 'fuel_filter', 'Fuel filter', 100, 12, '2026-06-01', 0),
        -- From 90 h: 95 h to go, not due by the meter.
        (1, 1, 'oil', 'Oil', 100, 12, '2026-06-01', 90),
        -- 50 h from 50 h, at 95 h: 5 h left, exactly the last tenth, a float away from either
        -- side: the evaluator's to judge; and a meter the evaluator refuses (negative), its too.
        (1, 1, 'spark_plug', 'Plug', 50, null, '2026-06-01', 50),
        (1, 1, 'other', 'Belt', 100, null, '2026-06-01', -5),
        -- Never done; and one on the archived machine: not judged.
        (1, 1, 'in_tank_strainer', 'Strainer', null, 12, null, null),
        (1, 2, 'fuel_filter', 'Fuel filter', 100, 12, '2026-06-01', 0)`);
    await migrate(database);
    const rows = await queryRows<{
      label: string;
      machine: number;
      judged: string | null;
      soon: string | null;
      meter: string | null;
    }>(
      database.db,
      sql`select label, machine_id as machine, judged_by as judged, to_char(due_soon_on, 'YYYY-MM-DD') as soon,
            to_char(meter_due_since at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI') as meter
          from service_intervals order by id`,
    );
    expect(rows).toEqual([
      { label: 'Fuel filter', machine: 1, judged: 'database', soon: '2027-04-26', meter: '2026-11-18T15:00' },
      { label: 'Oil', machine: 1, judged: 'database', soon: '2027-04-26', meter: null },
      { label: 'Plug', machine: 1, judged: 'evaluator', soon: null, meter: null },
      { label: 'Belt', machine: 1, judged: 'evaluator', soon: null, meter: null },
      { label: 'Strainer', machine: 1, judged: null, soon: null, meter: null },
      { label: 'Fuel filter', machine: 2, judged: null, soon: null, meter: null },
    ]);
    if (database.engine === 'pglite') {
      // PGlite runs no autovacuum: the upgrade vacuumed the rewritten table, every page all-visible.
      const [table] = await queryRows<{ pages: number; visible: number }>(
        database.db,
        sql`select relpages as pages, relallvisible as visible from pg_class where relname = 'service_intervals'`,
      );
      expect(table!.pages).toBeGreaterThan(0);
      expect(table!.visible).toBe(table!.pages);
    }
  });
});
