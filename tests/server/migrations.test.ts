import { readFileSync } from 'node:fs';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { getTableConfig, PgTable } from 'drizzle-orm/pg-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { queryRows, type Database } from '../../server/db/client';
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
