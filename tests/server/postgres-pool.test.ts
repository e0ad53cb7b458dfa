/**
 * The PostgreSQL engine's connection pool, in the api-postgres project only (vite.config.ts): PGlite
 * runs in the server's own process and has no connection to lose.
 */
import { sql } from 'drizzle-orm';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import { openDatabase, queryRows, type Database } from '../../server/db/client';
import { cloneDatabase } from '../helpers/db';
import { urlFor } from '../helpers/postgres';

let database: Database;
beforeAll(async () => {
  database = await cloneDatabase('empty');
});
afterAll(() => database.close());

const backendPid = async () =>
  (await queryRows<{ pid: number }>(database.db, sql`select pg_backend_pid() as pid`))[0]!.pid;

describe('a pooled connection the server ends while it is idle', () => {
  it('is logged and dropped, and the next query opens a new one instead of the process stopping', async () => {
    const logged = vi.spyOn(console, 'error').mockImplementation(() => {});
    const before = await backendPid();

    // What a server restart or an administrator does to an idle session.
    const admin = new pg.Client({ connectionString: inject('postgres')!.url });
    await admin.connect();
    try {
      const ended = await admin.query('select pg_terminate_backend($1) as ended', [before]);
      expect(ended.rows[0].ended).toBe(true);
    } finally {
      await admin.end();
    }

    await vi.waitFor(() =>
      expect(logged).toHaveBeenCalledWith(expect.stringMatching(/^database connection lost while idle: /)),
    );
    const after = await backendPid();
    expect(after).not.toBe(before);
  });
});

describe('closing the database', () => {
  it('resolves only once the server holds none of its connections, so the database can be dropped at once', async () => {
    const [current] = await queryRows<{ name: string }>(database.db, sql`select current_database() as name`);
    const url = new URL(urlFor(inject('postgres')!.url, current!.name));
    url.searchParams.set('application_name', 'vanbay-closing');
    // Each connection of this pool says when the server has closed it ('end', pg's own event).
    let ended = 0;
    const connect = pg.Client.prototype.connect;
    vi.spyOn(pg.Client.prototype, 'connect').mockImplementation(function (
      this: pg.Client,
      ...args: unknown[]
    ) {
      if (
        (this as unknown as { connectionParameters: { application_name?: string } }).connectionParameters
          .application_name === 'vanbay-closing'
      )
        this.once('end', () => (ended += 1));
      return (connect as unknown as (...a: unknown[]) => Promise<void>).apply(this, args);
    });
    const closing = await openDatabase({ engine: 'postgres', url: url.toString() });
    // Six queries at once: the pool opens six connections.
    await Promise.all(Array.from({ length: 6 }, () => queryRows(closing.db, sql`select pg_sleep(0.05)`)));
    const held = sql`select count(*)::int as n from pg_stat_activity where application_name = 'vanbay-closing'`;
    expect((await queryRows<{ n: number }>(database.db, held))[0]!.n).toBe(6);

    // Asking a connection to end is one message; it has ended when the server closes the socket.
    // `close()` resolving before that is what let a drop right after it cut them off (and each
    // then reported the cut as an error).
    await closing.close();
    expect(ended).toBe(6);
    expect((await queryRows<{ n: number }>(database.db, held))[0]!.n).toBe(0);
  });
});
