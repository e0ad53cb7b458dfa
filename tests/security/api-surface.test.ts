/**
 * The HTTP surface of the API against attack (issue "Proof"), on one app built with a signing key
 * the test knows, its request log captured and its uploads directory in hand:
 *
 * - The session cookie's flags. tests/server/auth.test.ts proves HttpOnly and SameSite=Strict on
 *   sign-in; here: Path, a lifetime no longer than the token's, Secure behind TLS, cleared on
 *   sign-out, set again with the same flags on a password change.
 * - Cross-site request forgery. auth.test.ts proves one refused cross-site POST; here every kind
 *   of forgery on one route, and every write route the app serves (read from its router), each
 *   refused with 403 and nothing stored; same-origin and Bearer writes let through; no CORS grant.
 * - Secrets: not the signing key, a password hash, a password or anyone's token in any response
 *   (every GET the access matrix names, as the owner and as a customer, and the writes that
 *   handle passwords) or in any log line (the request log and the error handler's output). The
 *   server process's own output is checked in tests/reliability/crash-restart.test.ts.
 * - Uploads, fuzzed with fast-check (fixed seeds). tests/server/attachments.test.ts proves the
 *   cases by example — the 10 MiB cap (413 at 11 MB, exactly 10 MiB taken), each accepted
 *   signature, a text file called photo.jpg, "../../etc/passwd" and other hostile names; here
 *   arbitrary names and arbitrary bytes, and what must hold for all of them.
 */
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readdirSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createApp } from '../../server/app';
import { signSession } from '../../server/auth/tokens';
import { queryRows, type Database } from '../../server/db/client';
import * as t from '../../server/db/schema';
import { DEMO_PASSWORD, demoUsers } from '../../server/db/seed-data';
import { SESSION_COOKIE } from '../../shared/api/auth';
import type { Role } from '../../shared/api/users';
import { as, type TestApi } from '../helpers/api';
import { cloneDatabase } from '../helpers/db';
import { SEED_TODAY } from '../helpers/fixtures';
import { loadFixtures } from '../server/access/fixtures';
import type { Fixtures } from '../server/access/types';
import { accessRows, appRoutes, tableWatch, WRITE_METHODS, type AppRoute } from './routes';

const SEED = 20_261_119;
const secret = randomBytes(32);
/** Passwords only this file uses: a new account's, a changed one, and a wrong guess. */
const NEW_PASSWORD = 'kettle-brass-window-41';
const CHANGED_PASSWORD = 'another-long-password';
const WRONG_PASSWORD = 'not-my-password-7731';

/** Signatures of the accepted types, as attachments.test.ts takes them from their standards. */
const PNG = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]); // ISO/IEC 15948 §5.2
const JPEG = Buffer.from([0xff, 0xd8, 0xff]); // JFIF 1.02: SOI then a marker
const PDF = Buffer.from('%PDF-'); // ISO 32000-1 §7.5.2

/** A directory that holds only `uploads/`: anything written beside it escaped. */
const root = mkdtempSync(path.join(tmpdir(), 'vanbay-surface-'));
const uploadsDir = path.join(root, 'uploads');
mkdirSync(uploadsDir);

let database: Database;
let server: Server;
let host: string;
let api: TestApi;
let fixtures: Fixtures;
let owner: Record<string, string>;
let jobId: number;
const logLines: string[] = [];
/** Every token handed out in this file, and every answer read for the secrets check. */
const issued: string[] = [];
const seen: { what: string; text: string; ownToken?: string }[] = [];

function record(what: string, response: request.Response, ownToken?: string) {
  const headers = Object.entries(response.headers)
    .filter(([name]) => !(ownToken && name === 'set-cookie'))
    .map(([name, value]) => `${name}: ${String(value)}`)
    .join('\n');
  const body = Buffer.isBuffer(response.body) ? response.body.toString('latin1') : (response.text ?? '');
  seen.push({ what, text: `${headers}\n\n${body}`, ownToken });
}

beforeAll(async () => {
  database = await cloneDatabase('seeded');
  const clock = {
    now: new Date(SEED_TODAY),
    set(date: Date) {
      this.now = date;
    },
  };
  const app = createApp({
    db: database.db,
    secret: new Uint8Array(secret),
    clock: () => clock.now,
    uploadsDir,
    log: (line) => logLines.push(line),
  });
  server = app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  host = `127.0.0.1:${(server.address() as AddressInfo).port}`;
  // Real sign-ins for the owner and a customer (the tokens the server hands out, sign-in logged
  // too); the other roles' tokens signed as a sign-in would sign them.
  const tokens = {} as Record<Role, string>;
  const users = await database.db.select().from(t.users);
  for (const user of demoUsers) {
    if (user.role === 'owner' || user.role === 'customer') {
      const response = await signIn(user.email);
      record(`sign-in ${user.role}`, response, response.body.token);
      tokens[user.role] = response.body.token as string;
    } else {
      const row = users.find((u) => u.email === user.email)!;
      tokens[user.role] = (await signSession(new Uint8Array(secret), row, clock.now)).token;
    }
    issued.push(tokens[user.role]);
  }
  api = { database, app, tokens, clock, close: () => database.close() };
  fixtures = await loadFixtures(api);
  owner = as(api, 'owner');
  jobId = (await queryRows<{ id: number }>(database.db, sql`select id from jobs order by id limit 1`))[0]!.id;
});
afterAll(async () => {
  await new Promise((resolve) => server?.close(resolve));
  await database?.close();
});

async function signIn(email: string, headers: Record<string, string> = {}, password = DEMO_PASSWORD) {
  const response = await request(server)
    .post('/api/auth/sign-in')
    .set(headers)
    .send({ email, password })
    .expect(200);
  issued.push(response.body.token as string);
  return response;
}

interface SetCookie {
  name: string;
  value: string;
  /** Attribute names lower-cased (RFC 6265 §5.2: case-insensitive), valueless ones as ''. */
  attributes: Record<string, string>;
}

/** One Set-Cookie header as RFC 6265 §5.2 reads it: name=value, then `;`-separated attributes. */
function parseSetCookie(header: string): SetCookie {
  const [pair, ...rest] = header.split(';');
  const eq = pair!.indexOf('=');
  return {
    name: pair!.slice(0, eq).trim(),
    value: pair!.slice(eq + 1).trim(),
    attributes: Object.fromEntries(
      rest.map((part) => {
        const at = part.indexOf('=');
        return at < 0
          ? [part.trim().toLowerCase(), '']
          : [part.slice(0, at).trim().toLowerCase(), part.slice(at + 1).trim()];
      }),
    ),
  };
}

function sessionCookie(headers: Record<string, unknown>): SetCookie {
  const all = (headers['set-cookie'] as string[] | undefined) ?? [];
  const found = all.map(parseSetCookie).find((cookie) => cookie.name === SESSION_COOKIE);
  if (!found) throw new Error(`no ${SESSION_COOKIE} cookie in ${JSON.stringify(all)}`);
  return found;
}

/** The JWT's claims (RFC 7519 §7.2: the second base64url segment is the claims set). */
const claimsOf = (token: string) =>
  JSON.parse(Buffer.from(token.split('.')[1]!, 'base64url').toString('utf8')) as { exp: number; iat: number };

describe('the session cookie', () => {
  it('is HttpOnly, SameSite=Strict, for the whole site, and lives exactly as long as its token', async () => {
    const response = await signIn('owner@ridgeback.test');
    const cookie = sessionCookie(response.headers);
    expect(cookie.value).toBe(response.body.token);
    expect(cookie.attributes).toHaveProperty('httponly');
    expect(cookie.attributes.samesite).toBe('Strict');
    expect(cookie.attributes.path).toBe('/');
    // Plain http (the van's own network): Secure would make the browser drop it.
    expect(cookie.attributes).not.toHaveProperty('secure');
    // No Domain: a host-only cookie, never sent to sibling hosts (RFC 6265 §5.3 step 6).
    expect(cookie.attributes).not.toHaveProperty('domain');
    const { exp } = claimsOf(response.body.token);
    expect(Number(cookie.attributes['max-age'])).toBe(exp - Math.floor(api.clock.now.getTime() / 1000));
  });

  it('is Secure when the request came through a TLS proxy on this machine', async () => {
    const response = await signIn('helper@ridgeback.test', { 'X-Forwarded-Proto': 'https' });
    expect(sessionCookie(response.headers).attributes).toHaveProperty('secure');
  });

  it('is cleared on sign-out and set again, with the same flags, on a password change', async () => {
    const first = await signIn('books@ridgeback.test');
    const cookie = `${SESSION_COOKIE}=${first.body.token as string}`;
    const changed = await request(server)
      .post('/api/auth/password')
      .set('Cookie', cookie)
      .set('Origin', `http://${host}`)
      .send({ currentPassword: DEMO_PASSWORD, newPassword: CHANGED_PASSWORD })
      .expect(200);
    issued.push(changed.body.token as string);
    const renewed = sessionCookie(changed.headers);
    expect(renewed.value).toBe(changed.body.token);
    expect(renewed.value).not.toBe(first.body.token);
    expect(renewed.attributes).toHaveProperty('httponly');
    expect(renewed.attributes.samesite).toBe('Strict');
    expect(renewed.attributes.path).toBe('/');

    const out = await request(server)
      .post('/api/auth/sign-out')
      .set('Cookie', `${SESSION_COOKIE}=${renewed.value}`)
      .set('Origin', `http://${host}`)
      .expect(204);
    const cleared = sessionCookie(out.headers);
    expect(cleared.value).toBe('');
    // Expired: a date in the past (RFC 6265 §5.2.1) or Max-Age ≤ 0 (§5.2.2).
    const gone =
      (cleared.attributes.expires !== undefined && Date.parse(cleared.attributes.expires) < Date.now()) ||
      Number(cleared.attributes['max-age']) <= 0;
    expect(gone).toBe(true);
    expect(cleared.attributes.path).toBe('/');
  });
});

describe('cross-site request forgery', () => {
  let cookie: string;
  let writes: AppRoute[];
  beforeAll(async () => {
    cookie = `${SESSION_COOKIE}=${api.tokens.owner}`;
    writes = appRoutes(api.app).filter((route) => WRITE_METHODS.has(route.method));
  });

  const pathOf = (route: AppRoute) => route.pattern.replace(/:[a-z]+/gi, '1');

  /** What a page on another site can make the browser send along with the victim's cookie. */
  const forgeries: Record<string, Record<string, string>> = {
    'a foreign Origin': { Origin: 'https://elsewhere.example' },
    'Sec-Fetch-Site: cross-site': { 'Sec-Fetch-Site': 'cross-site' },
    // A sandboxed frame or a redirect across origins sends the opaque origin "null".
    'Origin: null': { Origin: 'null' },
    'another port of this host': { Origin: 'http://127.0.0.1:1' },
    'a same-site sibling': { 'Sec-Fetch-Site': 'same-site', Origin: 'https://sibling.127.0.0.1.example' },
  };

  /** A forged write as the signed-in owner's browser would send it; returns what went wrong, if anything. */
  async function forge(route: AppRoute, how: string, watch: Awaited<ReturnType<typeof tableWatch>>) {
    await watch.settle();
    const call = request(server)[route.method](pathOf(route));
    const response = await call
      .set('Cookie', cookie)
      .set(forgeries[how]!)
      .send({ name: 'Forged', status: 'void' });
    const changed = await watch.changedSince();
    return response.status !== 403 || changed.length > 0
      ? [
          `${route.method.toUpperCase()} ${route.pattern} with ${how}: ${response.status}, changed ${changed.join(', ') || 'nothing'}`,
        ]
      : [];
  }

  it('refuses every kind of forgery with 403, storing nothing', async () => {
    const watch = await tableWatch(api.database.db);
    const route: AppRoute = { method: 'post', pattern: '/api/customers' };
    const problems: string[] = [];
    for (const how of Object.keys(forgeries)) problems.push(...(await forge(route, how, watch)));
    expect(problems).toEqual([]);
  });

  it('refuses a forged write on every write route that takes a session', async () => {
    const watch = await tableWatch(api.database.db);
    const problems: string[] = [];
    const sessionless: string[] = [];
    for (const route of writes) {
      // Routes that answer without a session (sign-in, a signed webhook) have none to forge with.
      const anonymous = await request(server)[route.method](pathOf(route)).send({});
      if (anonymous.status !== 401) {
        sessionless.push(`${route.method.toUpperCase()} ${route.pattern}`);
        continue;
      }
      // The check sits in front of every route; this proves no write route is mounted before it.
      problems.push(...(await forge(route, 'a foreign Origin', watch)));
    }
    expect(problems).toEqual([]);
    expect(sessionless).toContain('POST /api/auth/sign-in');
    expect(writes.length - sessionless.length).toBeGreaterThanOrEqual(30);
  });

  it('lets the dashboard’s own same-origin writes and the CLI’s Bearer writes through', async () => {
    await request(server)
      .post('/api/customers')
      .set('Cookie', cookie)
      .set('Origin', `http://${host}`)
      .set('Sec-Fetch-Site', 'same-origin')
      .send({ name: 'Same Origin Customer' })
      .expect(201);
    // A Bearer token is never sent by a browser on its own, so no Origin check applies to it.
    await request(server)
      .post('/api/customers')
      .set(as(api, 'owner'))
      .set('Origin', 'https://elsewhere.example')
      .send({ name: 'Bearer Customer' })
      .expect(201);
  });

  it('opens nothing to other origins: no CORS grant on reads or on a pre-flight', async () => {
    const read = await request(server)
      .get('/api/auth/me')
      .set('Cookie', cookie)
      .set('Origin', 'https://elsewhere.example')
      .expect(200);
    expect(read.headers['access-control-allow-origin']).toBeUndefined();
    expect(read.headers['access-control-allow-credentials']).toBeUndefined();
    const preflight = await request(server)
      .options('/api/customers')
      .set('Origin', 'https://elsewhere.example')
      .set('Access-Control-Request-Method', 'POST')
      .set('Access-Control-Request-Headers', 'authorization, content-type');
    expect(preflight.headers['access-control-allow-origin']).toBeUndefined();
    expect(preflight.headers['access-control-allow-methods']).toBeUndefined();
    expect(preflight.headers['access-control-allow-headers']).toBeUndefined();
  });
});

describe('secrets', () => {
  it('are in no response and no log line, whatever is read or written', async () => {
    const errors = vi.spyOn(console, 'error').mockImplementation(() => {});
    const bearer = (role: Role) => ({ Authorization: `Bearer ${api.tokens[role]}` });

    // The writes that carry passwords: wrong sign-ins, a new account, a refused password change.
    for (const email of ['owner@ridgeback.test', 'nobody@ridgeback.test']) {
      record(
        `failed sign-in ${email}`,
        await request(server).post('/api/auth/sign-in').send({ email, password: WRONG_PASSWORD }),
      );
    }
    record(
      'create user',
      await request(server)
        .post('/api/users')
        .set(bearer('owner'))
        .send({ email: 'kit@ridgeback.test', name: 'Kit Ormsby', role: 'helper', password: NEW_PASSWORD })
        .expect(201),
    );
    const newcomer = await signIn('kit@ridgeback.test', {}, NEW_PASSWORD);
    record('sign-in newcomer', newcomer, newcomer.body.token);
    record(
      'refused password change',
      await request(server)
        .post('/api/auth/password')
        .set(bearer('helper'))
        .send({ currentPassword: WRONG_PASSWORD, newPassword: NEW_PASSWORD })
        .expect(400),
    );

    // Every read the matrix names, as the owner (who sees most) and as a customer (who is outside).
    // GET /api/backup is left out on purpose: it is the owner's restorable copy of the business,
    // users' password hashes included, so that a restore signs everyone in as before.
    const reads = accessRows().filter(
      (row) => row.method === 'get' && !row.name.startsWith('GET /api/backup'),
    );
    expect(reads.length).toBeGreaterThan(20);
    for (const row of reads) {
      for (const caller of ['owner', 'customer'] as const) {
        if (row.expect[caller] >= 300) continue;
        const path = await row.path(fixtures, caller);
        const response = await request(server)
          .get(path)
          .set(bearer(caller))
          .buffer(true)
          .parse((res, done) => {
            const chunks: Buffer[] = [];
            res.on('data', (chunk: Buffer) => chunks.push(chunk));
            res.on('end', () => done(null, Buffer.concat(chunks)));
          });
        record(`${row.name} as ${caller}`, response);
      }
    }

    const users = await queryRows<{ email: string; hash: string }>(
      database.db,
      sql`select email, password_hash as hash from users`,
    );
    expect(users.length).toBeGreaterThanOrEqual(5);
    const tokens = [...new Set(issued)];
    const forbidden: [string, string][] = [
      ['the session key (hex)', secret.toString('hex')],
      ['the session key (base64)', secret.toString('base64')],
      ['the session key (base64url)', secret.toString('base64url')],
      ...users.map((user): [string, string] => [`${user.email}'s password hash`, user.hash]),
      // The part after the algorithm's name, in case a hash is ever printed in another wrapping.
      ...users.map((user): [string, string] => [`${user.email}'s hash digest`, user.hash.split('$').at(-1)!]),
      ['the demo password', DEMO_PASSWORD],
      ['a new password', NEW_PASSWORD],
      ['a changed password', CHANGED_PASSWORD],
      ['a tried password', WRONG_PASSWORD],
    ];
    const leaks: string[] = [];
    for (const { what, text, ownToken } of seen) {
      for (const [name, value] of forbidden) if (text.includes(value)) leaks.push(`${what}: ${name}`);
      for (const token of tokens) {
        // A token's signature is the part that cannot be rebuilt from anything public.
        const signature = token.split('.')[2]!;
        if (token !== ownToken && text.includes(signature)) leaks.push(`${what}: a token`);
        if (token === ownToken && text.replace(JSON.stringify(token), '').includes(signature))
          leaks.push(`${what}: its token outside the "token" field`);
      }
      const keys = text.match(/"(password|passwordHash|password_hash|secret|sessionSecret)"\s*:/gi);
      if (keys) leaks.push(`${what}: field ${keys.join(', ')}`);
    }
    expect(leaks).toEqual([]);
    expect(seen.length).toBeGreaterThan(40);

    const logs = [
      ...logLines,
      ...errors.mock.calls.map((call) =>
        call.map((part) => (part instanceof Error ? part.stack : String(part))).join(' '),
      ),
    ];
    expect(logLines.length).toBeGreaterThanOrEqual(seen.length);
    const logLeaks = logs.flatMap((line) => [
      ...forbidden
        .filter(([, value]) => line.includes(value))
        .map(([name]) => `${name} in "${line.slice(0, 120)}"`),
      ...tokens
        .filter((token) => line.includes(token.split('.')[2]!))
        .map(() => `a token in "${line.slice(0, 120)}"`),
    ]);
    expect(logLeaks).toEqual([]);

    // The audit log keeps who signed in and from where, never what was typed.
    const audit = await queryRows<{ details: string | null }>(
      database.db,
      sql`select details::text as details from audit_events`,
    );
    const stored = audit.map((row) => row.details ?? '').join('\n');
    for (const [name, value] of forbidden) expect(stored.includes(value), name).toBe(false);
  });
});

/** RFC 7578 multipart with the name as `filename*` (RFC 8187), so any character can be sent. */
function upload(filename: string, bytes: Buffer, type: string) {
  const boundary = `fuzz-${randomUUID()}`;
  const head =
    `--${boundary}\r\nContent-Disposition: form-data; name="file"; ` +
    `filename*=UTF-8''${encodeURIComponent(filename)}\r\nContent-Type: ${type}\r\n\r\n`;
  const body = Buffer.concat([Buffer.from(head), bytes, Buffer.from(`\r\n--${boundary}--\r\n`)]);
  return request(server)
    .post(`/api/jobs/${jobId}/attachments`)
    .set(owner)
    .set('Content-Type', `multipart/form-data; boundary=${boundary}`)
    .send(body);
}

const storedFiles = () =>
  readdirSync(uploadsDir, { recursive: true, withFileTypes: true })
    .filter((entry) => entry.isFile())
    .map((entry) => path.relative(uploadsDir, path.join(entry.parentPath, entry.name)));
const rows = async () =>
  (await queryRows<{ n: number }>(database.db, sql`select count(*)::int as n from attachments`))[0]!.n;

/** Strings encodeURIComponent can send (no lone surrogate halves). */
const sendable = (text: string) => {
  try {
    encodeURIComponent(text);
    return true;
  } catch {
    return false;
  }
};

/** Names built to climb out: dot segments, both slashes, drive letters, NUL, bidi overrides … */
const hostileName = fc
  .oneof(
    fc
      .array(
        fc.constantFrom(
          '..',
          '.',
          '/',
          '\\',
          '%2e%2e',
          'etc',
          'passwd',
          'C:',
          '~',
          '\u0000',
          '\u202e',
          '\r\n',
          ' ',
          'a.png',
        ),
        { minLength: 1, maxLength: 8 },
      )
      .map((parts) => parts.join('')),
    fc.string({ unit: 'binary', maxLength: 40 }),
    fc.string({ unit: 'grapheme', minLength: 100, maxLength: 400 }),
  )
  .filter(sendable);

describe('upload names', () => {
  it('never leave the uploads directory and are stored cleaned, whatever they are', async () => {
    const problems: string[] = [];
    let accepted = 0;
    const names = fc.sample(hostileName, { seed: SEED, numRuns: 20 });
    for (const [i, name] of names.entries()) {
      const bytes = Buffer.concat([PNG, Buffer.from(`fuzz ${i}`)]);
      const response = await upload(name, bytes, 'image/png');
      if (response.status === 201) {
        accepted += 1;
        const stored = response.body.filename as string;
        const clean =
          stored.length > 0 &&
          [...stored].length <= 120 &&
          !/[/\\]/.test(stored) &&
          !/[\p{Cc}\p{Cf}]/u.test(stored) &&
          !stored.startsWith('.');
        if (!clean) problems.push(`${JSON.stringify(name)} stored as ${JSON.stringify(stored)}`);
        // The download names it safely too: a quoted ASCII fallback with nothing that ends the quotes.
        const file = await request(server)
          .get(response.body.url as string)
          .set(owner)
          .buffer(true);
        const disposition = String(file.headers['content-disposition']);
        if (
          !/^attachment; filename="[\x20-\x21\x23-\x5b\x5d-\x7e]*"(; filename\*=UTF-8''[\w%.!~*'()-]+)?$/.test(
            disposition,
          )
        )
          problems.push(`${JSON.stringify(name)} downloads as ${disposition}`);
      } else if (response.status !== 400) {
        problems.push(`${JSON.stringify(name)}: ${response.status} ${response.text.slice(0, 120)}`);
      }
    }
    expect(problems).toEqual([]);
    // Most are taken (cleaned), so the checks above ran on real stored names.
    expect(accepted).toBeGreaterThan(names.length / 2);
    // Only content-addressed files, <business>/<sha256>, and nothing beside the uploads directory.
    for (const file of storedFiles()) expect(file).toMatch(/^\d+\/[0-9a-f]{64}$/);
    expect(readdirSync(root)).toEqual(['uploads']);
  });
});

describe('upload types', () => {
  const declared = fc.constantFrom(
    'image/png',
    'image/jpeg',
    'application/pdf',
    'text/html',
    'image/svg+xml',
    '',
  );
  const startsWithSignature = (bytes: Buffer) =>
    [PNG, JPEG, PDF].some((signature) => bytes.subarray(0, signature.length).equals(signature));

  it('refuses bytes of no accepted type with 415 whatever the declared type, storing nothing', async () => {
    const cases = fc.sample(
      fc.record({
        bytes: fc
          .uint8Array({ minLength: 0, maxLength: 64 })
          .map((array) => Buffer.from(array))
          .filter(
            (bytes) => !startsWithSignature(bytes) && !/^(RIFF|....ftyp)/s.test(bytes.toString('latin1')),
          ),
        type: declared,
        name: fc.constantFrom('photo.jpg', 'gauge.png', 'receipt.pdf', 'page.html'),
      }),
      { seed: SEED + 1, numRuns: 15 },
    );
    const before = { rows: await rows(), files: storedFiles() };
    const problems: string[] = [];
    for (const { bytes, type, name } of cases) {
      const response = await upload(name, bytes, type || 'application/octet-stream');
      if (response.status !== 415) problems.push(`${bytes.toString('hex')} as ${type}: ${response.status}`);
    }
    expect(problems).toEqual([]);
    expect({ rows: await rows(), files: storedFiles() }).toEqual(before);
  });

  it('types an accepted file by its first bytes, not by what the client declared', async () => {
    const cases = fc.sample(
      fc.record({
        kind: fc.constantFrom(
          ['image/png', PNG] as const,
          ['image/jpeg', JPEG] as const,
          ['application/pdf', PDF] as const,
        ),
        tail: fc.uint8Array({ minLength: 8, maxLength: 64 }),
        type: declared,
      }),
      { seed: SEED + 2, numRuns: 12 },
    );
    for (const { kind, tail, type } of cases) {
      const [expected, signature] = kind;
      const bytes = Buffer.concat([signature, Buffer.from(tail)]);
      const response = await upload('upload.bin', bytes, type || 'application/octet-stream');
      expect(response.status, `${expected} declared ${type}: ${response.text}`).toBe(201);
      const file = await request(server)
        .get(response.body.url as string)
        .set(owner)
        .buffer(true)
        .parse((res, done) => {
          const chunks: Buffer[] = [];
          res.on('data', (chunk: Buffer) => chunks.push(chunk));
          res.on('end', () => done(null, Buffer.concat(chunks)));
        })
        .expect(200);
      expect(file.headers['content-type']).toBe(expected);
      expect(file.headers['x-content-type-options']).toBe('nosniff');
      // The same bytes back (SHA-256, FIPS 180-4).
      const hash = (b: Buffer) => createHash('sha256').update(b).digest('hex');
      expect(hash(file.body as Buffer)).toBe(hash(bytes));
    }
    expect(existsSync(path.join(root, 'etc'))).toBe(false);
  });
});
