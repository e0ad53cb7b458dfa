import { createHash, randomBytes } from 'node:crypto';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { signSession } from '../../server/auth/tokens';
import { queryRows, type Database } from '../../server/db/client';
import * as t from '../../server/db/schema';
import {
  BACKUP_CONTENT_TYPE,
  BackupDocumentSchema,
  RestoreResultSchema,
  type BackupDocument,
} from '../../shared/api/backup';
import { cloneDatabase, tempUploadsDir } from '../helpers/db';
import { SEED_TODAY } from '../helpers/fixtures';

interface App {
  database: Database;
  app: ReturnType<typeof createApp>;
  uploadsDir: string;
  businessId: number;
  /** Bearer headers of the demo owner and helper. */
  owner: Record<string, string>;
  helper: Record<string, string>;
  /** Bearer headers of any user, as a sign-in would sign them. */
  bearer(user: { id: number; businessId: number; tokenVersion: number }): Promise<Record<string, string>>;
  close(): Promise<void>;
}

/** A seeded app on a private clone, its uploads directory in hand so the test can look at the disk. */
async function seededApp(): Promise<App> {
  const database = await cloneDatabase('seeded');
  const uploadsDir = tempUploadsDir();
  const secret = new Uint8Array(randomBytes(32));
  const app = createApp({ db: database.db, clock: () => SEED_TODAY, uploadsDir, secret });
  const users = await database.db.select().from(t.users);
  const bearer = async (user: { id: number; businessId: number; tokenVersion: number }) => ({
    Authorization: `Bearer ${(await signSession(secret, user, SEED_TODAY)).token}`,
  });
  return {
    database,
    app,
    uploadsDir,
    businessId: users[0]!.businessId,
    owner: await bearer(users.find((u) => u.role === 'owner')!),
    helper: await bearer(users.find((u) => u.role === 'helper')!),
    bearer,
    close: () => database.close(),
  };
}

/** Every table with a business_id, read from the database's own catalogue, not from the code under test. */
async function businessOwnedTables(database: Database): Promise<string[]> {
  const rows = await queryRows<{ table_name: string }>(
    database.db,
    sql`select table_name from information_schema.columns
        where column_name = 'business_id' and table_schema = current_schema() order by table_name`,
  );
  return rows.map((row) => row.table_name);
}

/**
 * Every row of one business, per table, as PostgreSQL's own text form of the row (every column,
 * microseconds and all), sorted. The audit row a restore adds about itself is left out.
 */
async function snapshot(database: Database, businessId: number): Promise<Record<string, string[]>> {
  const parts: Record<string, string[]> = {};
  for (const table of ['businesses', ...(await businessOwnedTables(database))]) {
    const where =
      table === 'businesses'
        ? sql`x.id = ${businessId}`
        : table === 'audit_events'
          ? sql`x.business_id = ${businessId} and x.action <> 'backup.restored'`
          : sql`x.business_id = ${businessId}`;
    const rows = await queryRows<{ row: string }>(
      database.db,
      sql`select x::text as row from ${sql.identifier(table)} x where ${where} order by 1`,
    );
    parts[table] = rows.map((row) => row.row);
  }
  return parts;
}

/** Every file under a directory, with a hash of its bytes. */
function filesUnder(dir: string): Record<string, string> {
  if (!existsSync(dir)) return {};
  return Object.fromEntries(
    readdirSync(dir, { recursive: true, withFileTypes: true })
      .filter((entry) => entry.isFile())
      .map((entry) => {
        const file = path.join(entry.parentPath, entry.name);
        return [path.relative(dir, file), createHash('sha256').update(readFileSync(file)).digest('hex')];
      })
      .sort(([a], [b]) => a!.localeCompare(b!)),
  );
}

async function backupOf(api: App, headers = api.owner) {
  const response = await request(api.app).get('/api/backup').set(headers).expect(200);
  return { response, text: response.text, document: BackupDocumentSchema.parse(JSON.parse(response.text)) };
}

const restore = (api: App, body: string | BackupDocument, query = '') =>
  request(api.app)
    .post(`/api/backup/restore${query}`)
    .set(api.owner)
    .set('Content-Type', BACKUP_CONTENT_TYPE)
    .send(typeof body === 'string' ? body : JSON.stringify(body));

/**
 * A PDF as far as the upload's sniffing goes ("%PDF-" header, ISO 32000-1 §7.5.2), with enough
 * random bytes after it to span several of the backup's read chunks and end off a multiple of 3.
 */
const pdfBytes = () => Buffer.concat([Buffer.from('%PDF-1.7\n'), randomBytes(3 * 64 * 1024 * 2 + 1000)]);

async function attach(api: App, jobId: number, bytes: Buffer) {
  const response = await request(api.app)
    .post(`/api/jobs/${jobId}/attachments`)
    .set(api.owner)
    .attach('file', bytes, { filename: 'receipt.pdf', contentType: 'application/pdf' })
    .expect(201);
  return response.body as { id: number; url: string };
}

/** Another business on the same server, with its own owner and a customer. */
async function anotherBusiness(api: App) {
  const [other] = await api.database.db
    .insert(t.businesses)
    .values({
      slug: 'ember-hollow',
      name: 'Ember Hollow Small Engines',
      ownerName: 'Ash Verity',
      email: 'ash@emberhollow.test',
      labourRateCents: 8_000,
    })
    .returning();
  const [owner] = await api.database.db
    .insert(t.users)
    .values({
      businessId: other!.id,
      email: 'ash@emberhollow.test',
      name: 'Ash Verity',
      role: 'owner',
      passwordHash: 'not-a-real-hash',
    })
    .returning();
  await api.database.db.insert(t.customers).values({ businessId: other!.id, name: 'Wren Calloway' });
  return { id: other!.id, owner: owner! };
}

const firstJobId = async (api: App) =>
  (await api.database.db.select({ id: t.jobs.id }).from(t.jobs).orderBy(t.jobs.id).limit(1))[0]!.id;

describe('backup', () => {
  let api: App;
  let otherId: number;
  beforeAll(async () => {
    api = await seededApp();
    otherId = (await anotherBusiness(api)).id;
  });
  afterAll(() => api.close());

  it('streams a JSON attachment named for the business and its own day', async () => {
    const { response } = await backupOf(api);
    expect(response.headers['content-type']).toMatch(/^application\/json/);
    // SEED_TODAY is 15:00Z, 08:00 in Denver (UTC−7 in November): still the 18th there.
    expect(response.headers['content-disposition']).toBe(
      'attachment; filename="vanbay-backup-ridgeback-2026-11-18.json"',
    );
    expect(response.headers['cache-control']).toContain('no-store');
    // Written as it is read: no length known up front (RFC 9112 §7.1, chunked transfer coding).
    expect(response.headers['transfer-encoding']).toBe('chunked');
  });

  it("holds every business-owned table in foreign-key order, with this business's rows only", async () => {
    const { document } = await backupOf(api);
    const journal = JSON.parse(readFileSync('drizzle/meta/_journal.json', 'utf8')) as {
      entries: { tag: string }[];
    };
    expect(document).toMatchObject({
      format: 'vanbay-backup',
      version: 1,
      createdAt: SEED_TODAY.toISOString(),
      schemaMigration: journal.entries.at(-1)!.tag,
      business: { id: api.businessId, slug: 'ridgeback' },
    });
    const tables = await businessOwnedTables(api.database);
    expect(Object.keys(document.tables).sort()).toEqual(tables);

    const order = Object.keys(document.tables);
    const references = await queryRows<{ child: string; parent: string }>(
      api.database.db,
      sql`select conrelid::regclass::text as child, confrelid::regclass::text as parent
          from pg_constraint where contype = 'f' and conrelid <> confrelid`,
    );
    for (const { child, parent } of references.filter(
      (r) => order.includes(r.child) && order.includes(r.parent),
    ))
      expect(order.indexOf(parent), `${parent} before ${child}`).toBeLessThan(order.indexOf(child));

    for (const table of tables) {
      const rows = document.tables[table]!;
      expect(rows.every((row) => row.business_id === api.businessId)).toBe(true);
      const [count] = await queryRows<{ n: number }>(
        api.database.db,
        sql`select count(*)::int as n from ${sql.identifier(table)} where business_id = ${api.businessId}`,
      );
      expect(rows.length, table).toBe(count!.n);
      const columns = await queryRows<{ column_name: string }>(
        api.database.db,
        sql`select column_name from information_schema.columns where table_name = ${table} order by column_name`,
      );
      if (rows[0]) expect(Object.keys(rows[0]).sort(), table).toEqual(columns.map((c) => c.column_name));
    }
    expect(document.tables.customers!.some((row) => row.business_id === otherId)).toBe(false);
    expect(JSON.stringify(document)).not.toContain('Wren Calloway');
    // Password hashes travel, so people can sign in after a restore (the file is as secret as the database).
    expect(document.tables.users!.every((row) => typeof row.password_hash === 'string')).toBe(true);
  });

  it('is for the owner only', async () => {
    await request(api.app).get('/api/backup').set(api.helper).expect(403);
    await request(api.app).get('/api/backup').expect(401);
  });

  it('keeps serving after a client hangs up mid-download', async () => {
    // Several MB of file, so the server is still writing (and waiting on the socket) when the client goes.
    await attach(
      api,
      await firstJobId(api),
      Buffer.concat([Buffer.from('%PDF-1.7\n'), randomBytes(8 * 1024 * 1024)]),
    );
    const server = api.app.listen(0, '127.0.0.1');
    await new Promise((resolve) => server.once('listening', resolve));
    const { port } = server.address() as AddressInfo;
    try {
      const received = await new Promise<number>((resolve, reject) => {
        const call = http.get({ port, host: '127.0.0.1', path: '/api/backup', headers: api.owner }, (res) => {
          let bytes = 0;
          res.on('data', (chunk: Buffer) => {
            bytes += chunk.length;
            if (bytes > 64 * 1024) {
              call.destroy();
              resolve(bytes);
            }
          });
        });
        call.on('error', (error: NodeJS.ErrnoException) =>
          error.code === 'ECONNRESET' ? undefined : reject(error),
        );
      });
      expect(received).toBeGreaterThan(64 * 1024);
      const { document } = await backupOf(api);
      expect(Object.keys(document.files)).toHaveLength(1);
    } finally {
      await new Promise((resolve) => server.close(resolve));
    }
  });
});

describe('restore', () => {
  let source: App;
  let target: App;
  let fileBytes: Buffer;
  let attachment: { id: number; url: string };
  beforeAll(async () => {
    [source, target] = await Promise.all([seededApp(), seededApp()]);
    // Make the source differ from the seed the fresh clone starts from.
    fileBytes = pdfBytes();
    attachment = await attach(source, await firstJobId(source), fileBytes);
    await request(source.app)
      .post('/api/customers')
      .set(source.owner)
      .send({ name: 'Teodor Quill', town: 'Cinder Valley', addressLines: ['4 Basalt Row'] })
      .expect(201);
    await source.database.db.execute(
      sql`update customers set updated_at = '2026-11-18 15:00:00.123456+00' where name = 'Teodor Quill'`,
    );
    await source.database.db.execute(sql`update businesses set labour_rate_cents = 13500`);
  });
  afterAll(() => Promise.all([source.close(), target.close()]));

  it('onto a fresh clone gives the same data, table by table, and the same file bytes', async () => {
    const { text, document } = await backupOf(source);
    // Bigger than the 100 kB every other JSON route takes: the route reads it with its own limit.
    expect(text.length).toBeGreaterThan(100 * 1024);
    expect(Object.keys(document.files)).toHaveLength(1);

    const response = await restore(target, text).expect(200);
    const result = RestoreResultSchema.parse(response.body);
    expect(result.tables).toEqual(
      Object.fromEntries(Object.entries(document.tables).map(([name, rows]) => [name, rows.length])),
    );
    expect(result.files).toBe(1);

    expect(await snapshot(target.database, target.businessId)).toEqual(
      await snapshot(source.database, source.businessId),
    );
    const file = await request(target.app)
      .get(attachment.url)
      .set(target.owner)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(Buffer.compare(file.body as Buffer, fileBytes)).toBe(0);
  });

  it('audits the restore and hands out new ids after the restored ones', async () => {
    const [audit] = await target.database.db
      .select()
      .from(t.auditEvents)
      .where(eq(t.auditEvents.action, 'backup.restored'));
    expect(audit).toMatchObject({ entityType: 'business', entityId: String(target.businessId) });
    const [owner] = await target.database.db.select().from(t.users).where(eq(t.users.role, 'owner'));
    expect(audit!.actorId).toBe(owner!.id);

    const [max] = await queryRows<{ id: number }>(
      target.database.db,
      sql`select max(id)::int as id from customers`,
    );
    const created = await request(target.app)
      .post('/api/customers')
      .set(target.owner)
      .send({ name: 'Ione Pike' })
      .expect(201);
    expect(created.body.id).toBeGreaterThan(max!.id);
  });

  it('refuses a restored document posted as plain JSON over the shared 100 kB limit', async () => {
    const { text } = await backupOf(source);
    await request(target.app)
      .post('/api/backup/restore')
      .set(target.owner)
      .set('Content-Type', 'application/json')
      .send(text)
      .expect(413);
  });
});

describe('restore after changes', () => {
  let api: App;
  let otherId: number;
  beforeAll(async () => {
    api = await seededApp();
    otherId = (await anotherBusiness(api)).id;
  });
  afterAll(() => api.close());

  it('puts everything back as it was at the backup, and leaves the other business alone', async () => {
    const jobId = await firstJobId(api);
    await attach(api, jobId, pdfBytes());
    const { text } = await backupOf(api);
    const before = await snapshot(api.database, api.businessId);
    const filesBefore = filesUnder(api.uploadsDir);
    const otherBefore = await snapshot(api.database, otherId);

    const added = await request(api.app)
      .post('/api/customers')
      .set(api.owner)
      .send({ name: 'Marek Stile' })
      .expect(201);
    const [archived] = await api.database.db.select().from(t.customers).orderBy(t.customers.id).limit(1);
    await request(api.app).delete(`/api/customers/${archived!.id}`).set(api.owner).expect(204);
    await api.database.db.execute(
      sql`update businesses set tax_rate_ppm = 1, name = 'Renamed' where slug = 'ridgeback'`,
    );
    await api.database.db.execute(sql`delete from trips where business_id = ${api.businessId}`);
    await attach(api, jobId, pdfBytes());
    expect(await snapshot(api.database, api.businessId)).not.toEqual(before);

    await restore(api, text).expect(200);
    expect(await snapshot(api.database, api.businessId)).toEqual(before);
    // The file uploaded after the backup went with its row; the one from before stayed.
    expect(filesUnder(api.uploadsDir)).toEqual(filesBefore);
    expect(await snapshot(api.database, otherId)).toEqual(otherBefore);
    // An id once handed out is not handed out again.
    const next = await request(api.app)
      .post('/api/customers')
      .set(api.owner)
      .send({ name: 'Nell Ord' })
      .expect(201);
    expect(next.body.id).toBeGreaterThan(added.body.id as number);
  });

  it('keeps sign-outs and ended sessions ended', async () => {
    const { text } = await backupOf(api);
    // Sign the helper out everywhere after the backup: their old token must stay dead.
    await api.database.db.execute(
      sql`update users set token_version = token_version + 1 where role = 'helper'`,
    );
    await request(api.app).get('/api/auth/me').set(api.helper).expect(401);
    // And one of the owner's sessions signed out after the backup.
    const [owner] = await api.database.db.select().from(t.users).where(eq(t.users.role, 'owner'));
    const laptop = await api.bearer(owner!);
    await request(api.app).post('/api/auth/sign-out').set(laptop).expect(204);
    await request(api.app).get('/api/auth/me').set(laptop).expect(401);

    await restore(api, text).expect(200);
    await request(api.app).get('/api/auth/me').set(api.helper).expect(401);
    await request(api.app).get('/api/auth/me').set(laptop).expect(401);
    await request(api.app).get('/api/auth/me').set(api.owner).expect(200);
  });

  it('restores a backup whose slug differs only when forced, keeping this business’s slug', async () => {
    const { document } = await backupOf(api);
    const renamed = {
      ...document,
      business: { ...document.business, slug: 'ridgeback-old', name: 'Old Name' },
    };
    await restore(api, renamed).expect(400);
    await restore(api, renamed, '?force=true').expect(200);
    const [business] = await api.database.db
      .select()
      .from(t.businesses)
      .where(eq(t.businesses.id, api.businessId));
    expect(business).toMatchObject({ slug: 'ridgeback', name: 'Old Name' });
  });
});

describe('a refused restore changes nothing', () => {
  let api: App;
  let good: BackupDocument;
  let theirs: BackupDocument;
  beforeAll(async () => {
    api = await seededApp();
    const other = await anotherBusiness(api);
    await attach(api, await firstJobId(api), pdfBytes());
    good = (await backupOf(api)).document;
    theirs = (await backupOf(api, await api.bearer(other.owner))).document;
    // A change made after the backup, which no refused restore may undo.
    await request(api.app).post('/api/customers').set(api.owner).send({ name: 'Odile Fenn' }).expect(201);
  });
  afterAll(() => api.close());

  const withFirstRow = (
    table: string,
    change: (row: Record<string, unknown>) => Record<string, unknown>,
  ) => ({
    ...good,
    tables: { ...good.tables, [table]: good.tables[table]!.map((row, i) => (i === 0 ? change(row) : row)) },
  });
  const fileKey = () => Object.keys(good.files)[0]!;

  const refusals: [string, () => unknown, string, number, RegExp][] = [
    ['another format', () => ({ ...good, format: 'shop-export' }), '', 400, /not a Vanbay backup/],
    ['another version of the format', () => ({ ...good, version: 2 }), '', 400, /version 1/],
    ["another business's backup", () => theirs, '', 400, /another business \("ember-hollow"/],
    // Forced, it still may not take ids another business holds here: nothing is overwritten.
    [
      "another business's backup, forced, onto the server holding it",
      () => theirs,
      '?force=true',
      409,
      /customers clash/,
    ],
    [
      'a newer schema',
      () => ({ ...good, schemaMigration: '9999_from_a_later_vanbay' }),
      '',
      400,
      /newer Vanbay/,
    ],
    [
      'a table it does not know',
      () => ({ ...good, tables: { ...good.tables, spare_parts: [] } }),
      '',
      400,
      /spare_parts/,
    ],
    [
      'a column it does not know',
      () => withFirstRow('customers', (row) => ({ ...row, shoe_size: 9 })),
      '',
      400,
      /shoe_size/,
    ],
    [
      'a row of another business',
      () => withFirstRow('jobs', (row) => ({ ...row, business_id: 999 })),
      '',
      400,
      /rows of another business/,
    ],
    [
      'a damaged file',
      () => ({ ...good, files: { [fileKey()]: Buffer.from('%PDF-1.7 tampered').toString('base64') } }),
      '',
      400,
      /checksum/,
    ],
    // Late in foreign-key order: every earlier table has been deleted and re-inserted by then.
    [
      'a value the database refuses',
      () => withFirstRow('reminders', (row) => ({ ...row, status: 'maybe' })),
      '',
      400,
      /reminders/,
    ],
  ];

  it.each(refusals)('refuses %s', async (_name, body, query, status, message) => {
    const before = await snapshot(api.database, api.businessId);
    const files = filesUnder(api.uploadsDir);
    const response = await restore(api, JSON.stringify(body()), query).expect(status);
    expect(response.body.error.message).toMatch(message);
    expect(await snapshot(api.database, api.businessId)).toEqual(before);
    expect(filesUnder(api.uploadsDir)).toEqual(files);
  });

  it('refuses a wrong format sent as plain JSON too, and a non-owner outright', async () => {
    const before = await snapshot(api.database, api.businessId);
    const plain = await request(api.app)
      .post('/api/backup/restore')
      .set(api.owner)
      .send({ format: 'shop-export' })
      .expect(400);
    expect(plain.body.error.message).toMatch(/not a Vanbay backup/);
    await request(api.app)
      .post('/api/backup/restore')
      .set(api.helper)
      .set('Content-Type', BACKUP_CONTENT_TYPE)
      .send(JSON.stringify(good))
      .expect(403);
    expect(await snapshot(api.database, api.businessId)).toEqual(before);
  });
});
