/**
 * What the security tests walk: every route the app itself serves (read from Express's router, so
 * a new route is covered without a change here), matched to the access-matrix rows beside
 * tests/server/access-matrix.test.ts (every route must have one there) for a real path and a
 * valid body to start from; and a fingerprint of every table, to prove a refusal stored nothing.
 */
import { sql } from 'drizzle-orm';
import { queryRows, type Db } from '../../server/db/client';
import type { Caller, TestApi } from '../helpers/api';
import type { AccessRow, Fixtures } from '../server/access/types';

export interface AppRoute {
  method: 'get' | 'post' | 'patch' | 'put' | 'delete';
  /** Express's pattern, e.g. `/api/jobs/:id/readings`. */
  pattern: string;
}

interface Layer {
  route?: { path: string; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
}

/** Every method × path the app answers, in the order Express tries them. */
export function appRoutes(app: TestApi['app']): AppRoute[] {
  const routes: AppRoute[] = [];
  const walk = (stack: Layer[]) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const method of Object.keys(layer.route.methods)) {
          routes.push({ method: method as AppRoute['method'], pattern: layer.route.path });
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack);
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack);
  return routes.filter((route) => route.pattern.startsWith('/api/'));
}

export const WRITE_METHODS: ReadonlySet<AppRoute['method']> = new Set(['post', 'patch', 'put', 'delete']);

/** Every row of every list in tests/server/access/, new files included. */
export function accessRows(): AccessRow[] {
  const modules = import.meta.glob<Record<string, unknown>>('../server/access/*.ts', { eager: true });
  return Object.values(modules).flatMap((exports) =>
    Object.values(exports)
      .filter(
        (value): value is AccessRow[] =>
          Array.isArray(value) &&
          value.every((row) => typeof row === 'object' && row !== null && 'expect' in row && 'path' in row),
      )
      .flat(),
  );
}

/** `/api/jobs/:own/readings` and `/api/jobs/:id/readings` are the same route. */
const normalise = (pattern: string) => pattern.replace(/:[a-z]+/gi, ':id');

/** The rows that name a route (a row's name starts with its method and pattern). */
export function rowsFor(rows: AccessRow[], route: AppRoute): AccessRow[] {
  return rows.filter(
    (row) =>
      row.method === route.method && normalise(row.name.split(' ')[1] ?? '') === normalise(route.pattern),
  );
}

/** The signed-in caller a row lets furthest in (owner first), so a body meets the validation. */
export function callerFor(row: AccessRow): Caller {
  const order: Caller[] = ['owner', 'helper', 'bookkeeper', 'customer'];
  return order.find((caller) => ![401, 403].includes(row.expect[caller])) ?? 'owner';
}

/** A concrete path and a valid body for a route, from its first row; none when no row names it. */
export async function targetFor(
  rows: AccessRow[],
  route: AppRoute,
  fixtures: Fixtures,
): Promise<{ path: string; body: unknown; caller: Caller } | null> {
  const row = rowsFor(rows, route)[0];
  if (!row) return null;
  const caller = callerFor(row);
  const path = await row.path(fixtures, caller);
  return { path, body: row.body?.(fixtures, caller), caller };
}

/**
 * Every table's row count and an order-free sum of hashes of its rows' text: a write of any
 * kind (insert, update, delete) in any table changes it. One query, cheap enough to run around
 * every request.
 */
export async function tablesFingerprint(db: Db): Promise<Record<string, string>> {
  const tables = await queryRows<{ name: string }>(
    db,
    sql`select table_name as name from information_schema.tables
        where table_schema = current_schema() and table_type = 'BASE TABLE' order by table_name`,
  );
  const parts = tables.map(
    ({ name }) =>
      sql`select ${name} as name, count(*)::text || ':' || coalesce(sum(hashtextextended(x::text, 0)), 0)::text as print
          from ${sql.identifier(name)} x`,
  );
  const rows = await queryRows<{ name: string; print: string }>(db, sql.join(parts, sql` union all `));
  return Object.fromEntries(rows.map((row) => [row.name, row.print]));
}

/**
 * PostgreSQL's next transaction id: it moves only when a transaction writes (or locks a row), so
 * while it stands still nothing can have been stored, and the full fingerprint need not be taken.
 */
export async function writeMark(db: Db): Promise<string> {
  const [row] = await queryRows<{ mark: string }>(
    db,
    sql`select pg_snapshot_xmax(pg_current_snapshot())::text as mark`,
  );
  return row!.mark;
}

/**
 * Watches every table across requests: `changedSince()` names the tables written since the last
 * `settle()`, taking the full fingerprint only when some transaction has written at all.
 */
export async function tableWatch(db: Db) {
  let mark = await writeMark(db);
  let print = await tablesFingerprint(db);
  return {
    /** Takes the current state as the one to compare with. */
    async settle() {
      const now = await writeMark(db);
      if (now === mark) return;
      mark = now;
      print = await tablesFingerprint(db);
    },
    /** The tables whose rows differ from the settled state (and settles on the new one). */
    async changedSince(): Promise<string[]> {
      const now = await writeMark(db);
      if (now === mark) return [];
      const next = await tablesFingerprint(db);
      const changed = changedTables(print, next);
      mark = now;
      print = next;
      return changed;
    },
  };
}

/** The tables whose fingerprints differ. */
export function changedTables(before: Record<string, string>, after: Record<string, string>): string[] {
  return Object.keys({ ...before, ...after }).filter((name) => before[name] !== after[name]);
}
