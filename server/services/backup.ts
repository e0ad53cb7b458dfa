/**
 * Backup and restore of one business's whole data (PRODUCT.md, "Backup and restore"), as the
 * logical document of shared/api/backup.ts. Rows are read and written by PostgreSQL itself
 * (`row_to_json` out, `json_populate_recordset` in), so every value round-trips exactly on PGlite
 * and on PostgreSQL alike, and the tables come from server/db/schema.ts: a table added there with a
 * `business_id` is backed up without a change here.
 */
import { createHash, randomUUID } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { mkdir, open, rename, stat, unlink, type FileHandle } from 'node:fs/promises';
import path from 'node:path';
import { TZDate } from '@date-fns/tz';
import { formatISO } from 'date-fns';
import { is, sql } from 'drizzle-orm';
import { toSnakeCase } from 'drizzle-orm/casing';
import { getTableConfig, PgTable, type PgColumn } from 'drizzle-orm/pg-core';
import {
  BACKUP_FILE_KEY,
  BACKUP_FORMAT,
  BACKUP_VERSION,
  backupFilename,
  type BackupDocument,
  type RestoreResult,
} from '../../shared/api/backup';
import type { Actor } from '../auth/actor';
import { queryRows, type Db } from '../db/client';
import { MIGRATIONS_FOLDER } from '../db/migrate';
import * as schema from '../db/schema';
import { BadRequestError, ConflictError } from '../errors';
import { recordAudit } from './audit';
import { found } from './scope';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
type Row = Record<string, unknown>;

// --- The tables -------------------------------------------------------------------------------

interface TableInfo {
  name: string;
  /** SQL column names, as drizzle's snake_case casing writes them. */
  columns: ReadonlySet<string>;
  primaryKey: string;
  /** The identity column, whose sequence a restore moves past the restored ids. */
  identity: string | null;
  /**
   * Columns the database works out from the others (generated always as …, or kept by a trigger,
   * schema.KEPT_BY_DATABASE): read, never written.
   */
  computed: ReadonlySet<string>;
  /** Tables this one's foreign keys point at. */
  references: string[];
}

const sqlName = (column: PgColumn) => (column.keyAsName ? toSnakeCase(column.name) : column.name);

function describeTable(table: PgTable): TableInfo {
  const config = getTableConfig(table);
  const primary = config.columns.find((column) => column.primary);
  if (!primary) throw new Error(`table ${config.name} has no single-column primary key to page on`);
  const identity = config.columns.find((column) => column.generatedIdentity);
  return {
    name: config.name,
    columns: new Set(config.columns.map(sqlName)),
    primaryKey: sqlName(primary),
    identity: identity ? sqlName(identity) : null,
    computed: new Set([
      ...config.columns.filter((column) => column.generated).map(sqlName),
      ...(schema.KEPT_BY_DATABASE[config.name] ?? []),
    ]),
    references: config.foreignKeys.map((key) => getTableConfig(key.reference().foreignTable).name),
  };
}

/** Parents before children (Kahn's algorithm), ties in the schema's own order. */
function inForeignKeyOrder(tables: TableInfo[]): TableInfo[] {
  const names = new Set(tables.map((table) => table.name));
  const placed = new Set<string>();
  const order: TableInfo[] = [];
  while (order.length < tables.length) {
    const next = tables.find(
      (table) =>
        !placed.has(table.name) &&
        table.references.every((ref) => ref === table.name || placed.has(ref) || !names.has(ref)),
    );
    if (!next) throw new Error('the business-owned tables reference each other in a cycle');
    placed.add(next.name);
    order.push(next);
  }
  return order;
}

const BUSINESSES = describeTable(schema.businesses);

/** Every table with a `business_id`, in foreign-key order: the order of a backup and of a restore. */
export const BUSINESS_TABLES: readonly TableInfo[] = inForeignKeyOrder(
  (Object.values(schema) as unknown[])
    .filter((value): value is PgTable => is(value, PgTable))
    .map(describeTable)
    .filter((table) => table.columns.has('business_id')),
);

/** Migration tags in the order drizzle applies them (drizzle/meta/_journal.json). */
function readMigrationTags(): string[] {
  const journal = JSON.parse(readFileSync(path.join(MIGRATIONS_FOLDER, 'meta', '_journal.json'), 'utf8')) as {
    entries: { idx: number; tag: string }[];
  };
  return [...journal.entries].sort((a, b) => a.idx - b.idx).map((entry) => entry.tag);
}
const MIGRATION_TAGS = readMigrationTags();
export const LATEST_MIGRATION = MIGRATION_TAGS.at(-1)!;

const PAGE_ROWS = 500;
/** A multiple of 3, so each chunk's base64 joins the next one's without padding in between. */
const FILE_CHUNK_BYTES = 3 * 64 * 1024;

const filePath = (uploadsDir: string, businessId: number, hash: string) =>
  path.join(uploadsDir, String(businessId), hash);

/** The same lock the attachments service takes: a file is never removed while being written. */
const lockStorageKey = (tx: Tx, storageKey: string) =>
  tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${storageKey}, 0))`);

// --- Backup -----------------------------------------------------------------------------------

/** Where the document goes: the HTTP response, in the route. */
export interface BackupSink {
  /** Called once, before the first byte, with the file name to offer. */
  start(filename: string): void;
  /** Resolves once the chunk may be followed by the next (back-pressure). */
  write(chunk: string): Promise<void>;
}

/**
 * Writes the business's backup to `sink` as it is read. The rows come from one read-only,
 * repeatable-read transaction (one consistent moment); the files, most of the bytes, are read after
 * it has closed, so PGlite's one connection is not held while they stream. A file removed in
 * between is left out, as it is gone from the data too.
 */
export async function writeBackup(
  db: Db,
  actor: Actor,
  { uploadsDir, now }: { uploadsDir: string; now: Date },
  sink: BackupSink,
): Promise<void> {
  const storageKeys = await db.transaction(
    async (tx) => {
      const [business] = await queryRows<{ json: string; slug: string; timezone: string }>(
        tx,
        sql`select row_to_json(b)::text as json, b.slug, b.timezone from businesses b where b.id = ${actor.businessId}`,
      );
      const { json, slug, timezone } = found(business, 'business');
      sink.start(backupFilename(slug, formatISO(new TZDate(now, timezone), { representation: 'date' })));
      await sink.write(
        `{"format":${JSON.stringify(BACKUP_FORMAT)},"version":${BACKUP_VERSION},` +
          `"createdAt":${JSON.stringify(now.toISOString())},"schemaMigration":${JSON.stringify(LATEST_MIGRATION)},` +
          `\n"business":${json},\n"tables":{`,
      );
      const keys = new Set<string>();
      for (const [index, table] of BUSINESS_TABLES.entries()) {
        await sink.write(`${index === 0 ? '' : ','}\n${JSON.stringify(table.name)}:[`);
        let written = 0;
        for await (const rows of pagesOf(tx, table, actor.businessId)) {
          await sink.write(rows.map((row, i) => `${written + i === 0 ? '' : ','}\n${row}`).join(''));
          written += rows.length;
          if (table.name === 'attachments') {
            for (const row of rows) keys.add((JSON.parse(row) as { storage_key: string }).storage_key);
          }
        }
        await sink.write(']');
      }
      return keys;
    },
    { isolationLevel: 'repeatable read', accessMode: 'read only' },
  );
  await sink.write('},\n"files":{');
  let first = true;
  for (const key of [...storageKeys].sort()) {
    const parts = BACKUP_FILE_KEY.exec(key);
    if (!parts) continue;
    const handle = await openIfPresent(filePath(uploadsDir, Number(parts[1]), parts[2]!));
    if (!handle) continue;
    try {
      await sink.write(`${first ? '' : ','}\n${JSON.stringify(key)}:"`);
      await writeBase64(handle, sink);
      await sink.write('"');
      first = false;
    } finally {
      await handle.close();
    }
  }
  await sink.write('}}\n');
}

/** One table's rows of the business as JSON text, in pages by primary key. */
async function* pagesOf(tx: Tx, table: TableInfo, businessId: number): AsyncGenerator<string[]> {
  const key = sql.identifier(table.primaryKey);
  let after: unknown;
  for (;;) {
    const page = await queryRows<{ json: string; cursor: unknown }>(
      tx,
      sql`select row_to_json(x)::text as json, x.${key} as cursor from ${sql.identifier(table.name)} x
          where x.business_id = ${businessId} ${after === undefined ? sql`` : sql`and x.${key} > ${after}`}
          order by x.${key} limit ${PAGE_ROWS}`,
    );
    if (page.length > 0) yield page.map((row) => row.json);
    if (page.length < PAGE_ROWS) return;
    after = page.at(-1)!.cursor;
  }
}

async function openIfPresent(file: string): Promise<FileHandle | null> {
  return open(file, 'r').catch((error: NodeJS.ErrnoException) => {
    if (error.code === 'ENOENT') return null;
    throw error;
  });
}

/** The file's bytes as base64, a chunk at a time; bytes left over from a short read carry on. */
async function writeBase64(handle: FileHandle, sink: BackupSink): Promise<void> {
  const buffer = Buffer.alloc(FILE_CHUNK_BYTES);
  let carry = Buffer.alloc(0);
  for (;;) {
    const { bytesRead } = await handle.read(buffer, 0, buffer.length, null);
    if (bytesRead === 0) break;
    const bytes = Buffer.concat([carry, buffer.subarray(0, bytesRead)]);
    const whole = bytes.length - (bytes.length % 3);
    await sink.write(bytes.subarray(0, whole).toString('base64'));
    carry = Buffer.from(bytes.subarray(whole));
  }
  if (carry.length > 0) await sink.write(carry.toString('base64'));
}

// --- Restore ----------------------------------------------------------------------------------

interface TablePlan {
  table: TableInfo;
  columns: string[];
  rows: Row[];
}

interface RestorePlan {
  business: Row;
  tables: TablePlan[];
  /** Bytes by storage key, already under the target business's id, each checked against its hash. */
  files: Map<string, Buffer>;
}

const refuse = (message: string) => new BadRequestError(`The backup cannot be restored: ${message}`);

/** The backup's rows of one table, checked: known columns, the same in every row, all of one business. */
function planTable(table: TableInfo, rows: Row[], from: number, to: number): TablePlan {
  const columns = rows[0] ? Object.keys(rows[0]) : [];
  const unknown = columns.find((column) => !table.columns.has(column));
  if (unknown) throw refuse(`${table.name} has a column this server does not know: "${unknown}"`);
  for (const required of ['business_id', table.primaryKey]) {
    if (rows.length > 0 && !columns.includes(required)) throw refuse(`${table.name} rows lack "${required}"`);
  }
  const planned = rows.map((row): Row => {
    const keys = Object.keys(row);
    if (keys.length !== columns.length || !keys.every((key) => Object.hasOwn(rows[0]!, key)))
      throw refuse(`the rows of ${table.name} do not all have the same columns`);
    if (row.business_id !== from) throw refuse(`${table.name} holds rows of another business`);
    return { ...row, business_id: to };
  });
  if (table.name === 'attachments') {
    for (const row of planned) {
      const parts = BACKUP_FILE_KEY.exec(String(row.storage_key));
      if (!parts || Number(parts[1]) !== from)
        throw refuse(`attachment ${String(row.id)} has a storage key outside the pattern`);
      row.storage_key = `${to}/${parts[2]}`;
    }
  }
  // A computed column's value in the backup is the one the database works out again on insert.
  return { table, columns: columns.filter((column) => !table.computed.has(column)), rows: planned };
}

/** Everything that can be checked before the database is touched. */
function planRestore(document: BackupDocument, targetBusinessId: number): RestorePlan {
  if (!MIGRATION_TAGS.includes(document.schemaMigration)) {
    throw refuse(
      `it was made by a newer Vanbay (database schema "${document.schemaMigration}"; this server's is ` +
        `"${LATEST_MIGRATION}"). Update Vanbay here first.`,
    );
  }
  const known = new Set(BUSINESS_TABLES.map((table) => table.name));
  const stranger = Object.keys(document.tables).find((name) => !known.has(name));
  if (stranger) throw refuse(`it has a table this server does not know: "${stranger}"`);
  const strangeSetting = Object.keys(document.business).find((column) => !BUSINESSES.columns.has(column));
  if (strangeSetting)
    throw refuse(`the business has a column this server does not know: "${strangeSetting}"`);

  const from = document.business.id;
  const tables = BUSINESS_TABLES.map((table) =>
    planTable(table, document.tables[table.name] ?? [], from, targetBusinessId),
  );
  const files = new Map<string, Buffer>();
  for (const [key, base64] of Object.entries(document.files)) {
    const [, owner, hash] = BACKUP_FILE_KEY.exec(key)!;
    if (Number(owner) !== from) throw refuse(`file ${key} belongs to another business`);
    const bytes = Buffer.from(base64, 'base64');
    if (createHash('sha256').update(bytes).digest('hex') !== hash)
      throw refuse(`file ${key} does not match its checksum: the backup is damaged`);
    files.set(`${targetBusinessId}/${hash}`, bytes);
  }
  return { business: document.business, tables, files };
}

/** A row the database refused: a clash with rows already here (409), or a bad value (400). */
function refusalFor(error: unknown, table: string): Error | null {
  const cause = (error as { cause?: { code?: unknown; message?: unknown; detail?: unknown } }).cause;
  const code = typeof cause?.code === 'string' ? cause.code : '';
  const said = [cause?.message, cause?.detail].filter((part) => typeof part === 'string').join(' ');
  if (code === '23505')
    return new ConflictError(`The backup's ${table} clash with rows already on this server: ${said}`);
  // SQLSTATE classes 22 (data exception) and 23 (integrity constraint violation), PostgreSQL Appendix A.
  if (code.startsWith('22') || code.startsWith('23')) return refuse(`${table} was refused: ${said}`);
  return null;
}

const columnList = (columns: string[]) =>
  sql.join(
    columns.map((column) => sql.identifier(column)),
    sql`, `,
  );

async function insertRows(tx: Tx, plan: TablePlan): Promise<void> {
  const { table, columns } = plan;
  const overriding =
    table.identity && columns.includes(table.identity) ? sql`overriding system value` : sql``;
  for (let at = 0; at < plan.rows.length; at += PAGE_ROWS) {
    const batch = JSON.stringify(plan.rows.slice(at, at + PAGE_ROWS));
    await tx.execute(
      sql`insert into ${sql.identifier(table.name)} (${columnList(columns)}) ${overriding}
          select ${columnList(columns)} from json_populate_recordset(null::${sql.identifier(table.name)}, ${batch}::json)`,
    );
  }
}

/** The next id handed out comes after every id now in the table, and never goes back. */
async function movePastIds(tx: Tx, table: TableInfo): Promise<void> {
  if (!table.identity) return;
  const column = sql.identifier(table.identity);
  await tx.execute(
    sql`select setval(s.seq, greatest(
          coalesce((select max(${column}) from ${sql.identifier(table.name)}), 0),
          coalesce(pg_sequence_last_value(s.seq), 0), 1))
        from (select pg_get_serial_sequence(${table.name}, ${table.identity})::regclass as seq) s`,
  );
}

async function writeFileAtomically(finalPath: string, bytes: Buffer): Promise<void> {
  await mkdir(path.dirname(finalPath), { recursive: true });
  const temp = path.join(path.dirname(finalPath), `.tmp-${randomUUID()}`);
  const handle = await open(temp, 'wx', 0o600);
  try {
    await handle.writeFile(bytes);
    await handle.sync();
  } finally {
    await handle.close();
  }
  await rename(temp, finalPath).catch(async (error: unknown) => {
    await unlink(temp).catch(() => undefined);
    throw error;
  });
}

const exists = (file: string) =>
  stat(file).then(
    (info) => info.isFile(),
    () => false,
  );

/** Files of attachments the restore removed, once no row holds them (as the attachments service does). */
async function removeUnreferenced(db: Db, uploadsDir: string, storageKeys: string[]): Promise<void> {
  for (const key of storageKeys) {
    const parts = BACKUP_FILE_KEY.exec(key);
    if (!parts) continue;
    await db.transaction(async (tx) => {
      await lockStorageKey(tx, key);
      const [using] = await queryRows<{ n: number }>(
        tx,
        sql`select count(*)::int as n from attachments where storage_key = ${key}`,
      );
      if ((using?.n ?? 0) > 0) return;
      await unlink(filePath(uploadsDir, Number(parts[1]), parts[2]!)).catch(
        (error: NodeJS.ErrnoException) => {
          if (error.code !== 'ENOENT') throw error;
        },
      );
    });
  }
}

/**
 * Replaces the business's data with the backup's, in one transaction: its rows deleted child
 * first, the backup's inserted parent first with their ids, each identity sequence moved past
 * them, the files written. Two things are kept from before rather than rolled back, so a restore
 * never brings an ended session back: each user's token version (the higher of the two) and the
 * sign-outs not yet expired. The business keeps its id and slug; the other settings are the
 * backup's. Anything refused leaves everything as it was.
 */
export async function restoreBackup(
  db: Db,
  actor: Actor,
  document: BackupDocument,
  { force, uploadsDir, now }: { force: boolean; uploadsDir: string; now: Date },
): Promise<RestoreResult> {
  const businessId = actor.businessId;
  const plan = planRestore(document, businessId);
  const { result, removedKeys } = await db.transaction(async (tx) => {
    const [business] = await queryRows<{ slug: string }>(
      tx,
      sql`select slug from businesses where id = ${businessId} for update`,
    );
    const { slug } = found(business, 'business');
    if (document.business.slug !== slug && !force) {
      throw refuse(
        `it is of another business ("${document.business.slug}", this one is "${slug}"); ` +
          'add force=true to restore it here anyway',
      );
    }
    const versions = new Map(
      (
        await queryRows<{ id: number; token_version: number }>(
          tx,
          sql`select id, token_version from users where business_id = ${businessId}`,
        )
      ).map((user) => [user.id, user.token_version]),
    );
    const signedOut = await queryRows<{ json: string; user_id: number }>(
      tx,
      sql`select row_to_json(r)::text as json, r.user_id from revoked_sessions r
          where r.business_id = ${businessId} and r.expires_at > ${now.toISOString()}`,
    );
    const keysBefore = await queryRows<{ key: string }>(
      tx,
      sql`select distinct storage_key as key from attachments where business_id = ${businessId}`,
    );

    for (const { table } of [...plan.tables].reverse()) {
      await tx.execute(sql`delete from ${sql.identifier(table.name)} where business_id = ${businessId}`);
    }
    const users = new Set(plan.tables.find((p) => p.table.name === 'users')?.rows.map((row) => row.id));
    let current = 'businesses';
    try {
      const settings = Object.keys(plan.business).filter((column) => column !== 'id' && column !== 'slug');
      if (settings.length > 0) {
        await tx.execute(
          sql`update businesses set (${columnList(settings)}) =
                (select ${columnList(settings)} from json_populate_record(null::businesses, ${JSON.stringify(plan.business)}::json))
              where id = ${businessId}`,
        );
      }
      for (const table of plan.tables) {
        current = table.table.name;
        if (current === 'users' && table.columns.includes('token_version')) {
          for (const row of table.rows)
            row.token_version = Math.max(Number(row.token_version), versions.get(Number(row.id)) ?? 0);
        }
        await insertRows(tx, table);
        await movePastIds(tx, table.table);
      }
      current = 'revoked_sessions';
      const kept = signedOut
        .filter((row) => users.has(row.user_id))
        .map((row) => JSON.parse(row.json) as Row);
      if (kept.length > 0) {
        await tx.execute(
          sql`insert into revoked_sessions select * from json_populate_recordset(null::revoked_sessions, ${JSON.stringify(kept)}::json)
              on conflict do nothing`,
        );
      }
    } catch (error) {
      throw refusalFor(error, current) ?? error;
    }

    const keysAfter = new Set(
      plan.tables.find((p) => p.table.name === 'attachments')?.rows.map((row) => String(row.storage_key)),
    );
    let files = 0;
    for (const key of [...keysAfter].sort()) {
      const [, owner, hash] = BACKUP_FILE_KEY.exec(key)!;
      const target = filePath(uploadsDir, Number(owner), hash!);
      const bytes = plan.files.get(key);
      await lockStorageKey(tx, key);
      // Content-addressed: a file already there under this key holds these very bytes.
      if (bytes && !(await exists(target))) await writeFileAtomically(target, bytes);
      if (bytes || (await exists(target))) files += 1;
    }

    const tables = Object.fromEntries(plan.tables.map((p) => [p.table.name, p.rows.length]));
    await recordAudit(tx, {
      businessId,
      actorId: users.has(actor.userId) ? actor.userId : null,
      action: 'backup.restored',
      entityType: 'business',
      entityId: businessId,
      details: {
        backupCreatedAt: document.createdAt,
        backupBusiness: document.business.slug,
        schemaMigration: document.schemaMigration,
        forced: document.business.slug !== slug,
        rows: Object.values(tables).reduce((sum, n) => sum + n, 0),
        files,
      },
      at: now,
    });
    return {
      result: {
        business: slug,
        backupCreatedAt: document.createdAt,
        schemaMigration: document.schemaMigration,
        tables,
        files,
      },
      removedKeys: keysBefore.map((row) => row.key).filter((key) => !keysAfter.has(key)),
    };
  });
  await removeUnreferenced(db, uploadsDir, removedKeys);
  return result;
}
