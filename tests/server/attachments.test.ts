import { createHash, randomUUID } from 'node:crypto';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { crc32, deflateSync } from 'node:zlib';
import { and, count, eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { queryRows } from '../../server/db/client';
import * as t from '../../server/db/schema';
import { DEMO_PASSWORD, demoUsers } from '../../server/db/seed-data';
import { sniffContentType } from '../../server/services/attachments';
import { AttachmentListSchema, AttachmentSchema } from '../../shared/api/attachments';
import type { Role } from '../../shared/api/users';
import { as, type Caller, type TestApi } from '../helpers/api';
import { cloneDatabase, tempUploadsDir } from '../helpers/db';
import { SEED_TODAY } from '../helpers/fixtures';

/** Like seededApi(), with the uploads directory in hand so the test can look at the disk. */
async function seededApiWithUploads(): Promise<TestApi & { uploadsDir: string }> {
  const database = await cloneDatabase('seeded');
  const uploadsDir = tempUploadsDir();
  const clock = {
    now: new Date(SEED_TODAY),
    set(date: Date) {
      this.now = date;
    },
  };
  const app = createApp({ db: database.db, clock: () => clock.now, uploadsDir });
  const tokens = {} as Record<Role, string>;
  for (const user of demoUsers) {
    const response = await request(app)
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: DEMO_PASSWORD })
      .expect(200);
    tokens[user.role] = response.body.token as string;
  }
  return { database, app, tokens, clock, uploadsDir, close: () => database.close() };
}

// --- Real minimal files, built from their published layouts ---------------------------------

function pngChunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([length, body, crc]);
}

/**
 * A 1 × 1 PNG: signature 89 50 4E 47 0D 0A 1A 0A, IHDR, IDAT, IEND (ISO/IEC 15948 §5.2, §11.2);
 * `seed` varies the pixel so each call can make different bytes.
 */
function minimalPng(seed = 0): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(1, 0); // width
  ihdr.writeUInt32BE(1, 4); // height
  ihdr.writeUInt8(8, 8); // bit depth
  ihdr.writeUInt8(2, 9); // colour type 2: truecolour
  const scanline = Buffer.from([0, seed & 0xff, (seed >> 8) & 0xff, 0x40]); // filter 0, then R G B
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk('IHDR', ihdr),
    pngChunk('IDAT', deflateSync(scanline)),
    pngChunk('IEND', Buffer.alloc(0)),
  ]);
}

/** SOI (FF D8), an APP0 "JFIF" segment (JFIF 1.02: version 1.02, no units, 1:1 density), EOI (FF D9). */
function minimalJpeg(): Buffer {
  return Buffer.from([
    0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01, 0x02, 0x00, 0x00, 0x01, 0x00,
    0x01, 0x00, 0x00, 0xff, 0xd9,
  ]);
}

/** An ISO BMFF `ftyp` box: size, "ftyp", major brand, minor version 0, compatible brands (ISO/IEC 14496-12 §4.3). */
function ftyp(major: string, ...compatible: string[]): Buffer {
  const size = Buffer.alloc(4);
  size.writeUInt32BE(16 + 4 * compatible.length);
  return Buffer.concat([
    size,
    Buffer.from(`ftyp${major}`, 'ascii'),
    Buffer.alloc(4),
    Buffer.from(compatible.join('')),
  ]);
}

/** RIFF header, size (little-endian), "WEBP", then a VP8L chunk header (RFC 9649 §2.5, §2.6). */
function minimalWebp(): Buffer {
  const size = Buffer.alloc(4);
  size.writeUInt32LE(12);
  return Buffer.concat([Buffer.from('RIFF'), size, Buffer.from('WEBPVP8L'), Buffer.from([0, 0, 0, 0])]);
}

// --- multipart/form-data, written by hand so every byte of the filename is the test's choice ---

interface FilePart {
  name: string;
  filename: string;
  type: string;
  bytes: Buffer;
  /** Send the name as `filename*` (RFC 7578 §4.2 allows it; RFC 8187 encoding) instead of raw bytes. */
  extended?: boolean;
}
type Part = FilePart | { name: string; value: string };

/** RFC 7578; a quote in a name is sent as %22, as browsers do (WHATWG HTML, form submission). */
function multipart(parts: Part[]): { body: Buffer; contentType: string } {
  const boundary = `vanbay-${randomUUID()}`;
  const chunks: Buffer[] = [];
  for (const part of parts) {
    const head = !('bytes' in part)
      ? `Content-Disposition: form-data; name="${part.name}"\r\n`
      : `Content-Disposition: form-data; name="${part.name}"; ${
          part.extended
            ? `filename*=UTF-8''${encodeURIComponent(part.filename)}`
            : `filename="${part.filename.replace(/"/g, '%22')}"`
        }\r\nContent-Type: ${part.type}\r\n`;
    chunks.push(Buffer.from(`--${boundary}\r\n${head}\r\n`, 'utf8'));
    chunks.push('bytes' in part ? part.bytes : Buffer.from(part.value, 'utf8'));
    chunks.push(Buffer.from('\r\n'));
  }
  chunks.push(Buffer.from(`--${boundary}--\r\n`));
  return { body: Buffer.concat(chunks), contentType: `multipart/form-data; boundary=${boundary}` };
}

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

/** Every file under a directory, as paths relative to it. */
function filesUnder(dir: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir, { recursive: true, withFileTypes: true })
    .filter((entry) => entry.isFile())
    .map((entry) => path.relative(dir, path.join(entry.parentPath, entry.name)))
    .sort();
}

/** Collects a response's raw bytes whatever its type (superagent only buffers the types it knows). */
const binary = (res: unknown, done: (err: Error | null, body: Buffer) => void) => {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (chunk: Buffer) => chunks.push(chunk));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
};

let api: Awaited<ReturnType<typeof seededApiWithUploads>>;
let ownJobId: number;
let otherJobId: number;

beforeAll(async () => {
  api = await seededApiWithUploads();
  const job = async (email: string) => {
    const [row] = await queryRows<{ id: number }>(
      api.database.db,
      sql`select j.id from jobs j join customers c on c.id = j.customer_id where c.email = ${email} order by j.id limit 1`,
    );
    return row!.id;
  };
  ownJobId = await job('jules@example.test');
  otherJobId = await job('rowan@example.test');
});
afterAll(() => api.close());

function upload(caller: Caller, jobId: number, parts: Part[]) {
  const { body, contentType } = multipart(parts);
  return request(api.app)
    .post(`/api/jobs/${jobId}/attachments`)
    .set(as(api, caller))
    .set('Content-Type', contentType)
    .send(body);
}

const file = (filename: string, bytes: Buffer, type = 'application/octet-stream'): FilePart => ({
  name: 'file',
  filename,
  type,
  bytes,
});

async function attachmentRows() {
  const [row] = await api.database.db.select({ n: count() }).from(t.attachments);
  return row!.n;
}

function download(caller: Caller, url: string) {
  return request(api.app).get(url).set(as(api, caller)).buffer(true).parse(binary);
}

describe('uploading', () => {
  it('accepts a PNG and a JPEG, typed from their first bytes, and stores them under their hash', async () => {
    const png = minimalPng(1);
    const jpeg = minimalJpeg();
    // The declared types are wrong on purpose: the server reads the bytes, not the label.
    const first = await upload('helper', ownJobId, [
      file('gauge.png', png, 'text/plain'),
      { name: 'caption', value: 'Fuel pressure at idle' },
    ]).expect(201);
    const second = await upload('owner', ownJobId, [file('wiring.jpg', jpeg, 'application/pdf')]).expect(201);
    const pngAttachment = AttachmentSchema.parse(first.body);
    const jpegAttachment = AttachmentSchema.parse(second.body);
    expect(pngAttachment).toMatchObject({
      jobId: ownJobId,
      filename: 'gauge.png',
      contentType: 'image/png',
      sizeBytes: png.length,
      caption: 'Fuel pressure at idle',
      readingId: null,
      url: `/api/jobs/${ownJobId}/attachments/${pngAttachment.id}/file`,
    });
    expect(jpegAttachment).toMatchObject({
      contentType: 'image/jpeg',
      sizeBytes: jpeg.length,
      caption: null,
    });

    const [row] = await api.database.db
      .select()
      .from(t.attachments)
      .where(eq(t.attachments.id, pngAttachment.id));
    // The stored hash is SHA-256 of the bytes (FIPS 180-4), cross-checked with node:crypto.
    expect(row).toMatchObject({ sha256: sha256(png), storageKey: `${row!.businessId}/${sha256(png)}` });
    expect(readFileSync(path.join(api.uploadsDir, row!.storageKey))).toEqual(png);
    expect(filesUnder(api.uploadsDir).some((name) => name.includes('.tmp-'))).toBe(false);
  });

  it('attaches to a reading of the same job, and lists by reading', async () => {
    const [reading] = await api.database.db
      .select({ id: t.readings.id, jobId: t.readings.jobId })
      .from(t.readings)
      .limit(1);
    const [elsewhere] = await api.database.db
      .select({ id: t.readings.id })
      .from(t.readings)
      .where(sql`${t.readings.jobId} <> ${reading!.jobId}`)
      .limit(1);
    const created = await upload('helper', reading!.jobId, [
      file('needle.png', minimalPng(2)),
      { name: 'readingId', value: String(reading!.id) },
    ]).expect(201);
    expect(created.body.readingId).toBe(reading!.id);
    const listed = await request(api.app)
      .get(`/api/jobs/${reading!.jobId}/attachments`)
      .query({ readingId: reading!.id })
      .set(as(api, 'owner'))
      .expect(200);
    expect(AttachmentListSchema.parse(listed.body).items.map((a) => a.id)).toEqual([created.body.id]);

    const before = await attachmentRows();
    const refused = await upload('helper', reading!.jobId, [
      file('needle.png', minimalPng(3)),
      { name: 'readingId', value: String(elsewhere!.id) },
    ]).expect(400);
    expect(refused.body.error.code).toBe('bad_request');
    expect(await attachmentRows()).toBe(before);
  });

  it('refuses a text file named photo.jpg with 415, whatever it is called or declared, and keeps nothing', async () => {
    const before = await attachmentRows();
    const filesBefore = filesUnder(api.uploadsDir);
    const text = Buffer.from('Not a photo: a shopping list for the van.\n', 'utf8');
    const response = await upload('owner', ownJobId, [file('photo.jpg', text, 'image/jpeg')]).expect(415);
    expect(response.body.error).toMatchObject({
      code: 'unsupported_media_type',
      message: expect.any(String),
    });
    expect(await attachmentRows()).toBe(before);
    expect(filesUnder(api.uploadsDir)).toEqual(filesBefore);
  });

  it('refuses an 11 MB upload with 413 in the error format, with nothing on disk or in the table', async () => {
    const before = await attachmentRows();
    const filesBefore = filesUnder(api.uploadsDir);
    // A valid PNG start followed by padding: only the size is wrong. 11 MiB > the 10 MiB cap.
    const big = Buffer.concat([minimalPng(4), Buffer.alloc(11 * 1024 * 1024)]);
    const response = await upload('owner', ownJobId, [file('huge.png', big, 'image/png')]).expect(413);
    expect(response.body.error).toMatchObject({ code: 'file_too_large', message: expect.any(String) });
    expect(await attachmentRows()).toBe(before);
    expect(filesUnder(api.uploadsDir)).toEqual(filesBefore);
  });

  it('accepts a file of exactly 10 MiB', async () => {
    const png = minimalPng(5);
    const exact = Buffer.concat([png, Buffer.alloc(10 * 1024 * 1024 - png.length)]);
    const response = await upload('owner', ownJobId, [file('exact.png', exact)]).expect(201);
    expect(response.body.sizeBytes).toBe(10 * 1024 * 1024);
  });

  it('stores a path-escaping or hostile filename safely: last part only, no control characters, ≤ 120', async () => {
    const long = `${'k'.repeat(300)}.png`;
    const cases: [string, string][] = [
      ['../../etc/passwd', 'passwd'],
      ['..\\..\\windows\\evil.png', 'evil.png'],

      ['..', 'attachment.png'],
      ['.hidden.png', 'hidden.png'],
      ['gauge "42" <psi>.png', 'gauge _42_ _psi_.png'],
      [long, `${'k'.repeat(116)}.png`],
    ];
    // Control and invisible format characters (BEL, a right-to-left override) travel percent-encoded.
    const encoded = await upload('owner', ownJobId, [
      { ...file('re\u0007ceipt\u202e.png', minimalPng(99)), extended: true },
    ]).expect(201);
    expect(encoded.body.filename).toBe('receipt.png');
    // Sent raw, a control character makes a malformed part header: refused with 400, not a 500.
    await upload('owner', ownJobId, [file('re\u0007ceipt.png', minimalPng(98))]).expect(400);
    for (const [i, [sent, stored]] of cases.entries()) {
      const response = await upload('owner', ownJobId, [file(sent, minimalPng(100 + i))]);
      expect(response.status, `${sent}: ${JSON.stringify(response.body)}`).toBe(201);
      expect(response.body.filename, sent).toBe(stored);
      expect([...response.body.filename].length).toBeLessThanOrEqual(120);
    }
    // Every stored file is <businessId>/<sha256> inside the uploads directory and nowhere else.
    for (const name of filesUnder(api.uploadsDir)) expect(name).toMatch(/^\d+\/[0-9a-f]{64}$/);
    expect(existsSync(path.join(api.uploadsDir, 'etc'))).toBe(false);
    expect(existsSync(path.join(path.dirname(api.uploadsDir), 'etc', 'passwd'))).toBe(false);
  });

  it('reads the other accepted types and refuses look-alikes', () => {
    const table: [string, Buffer, string | null][] = [
      // RFC 9649 §2.5: "RIFF", a size, "WEBP".
      ['WebP', minimalWebp(), 'image/webp'],
      // ISO/IEC 23008-12 brands (from memory): heic still image, mif1 generic, msf1 sequence.
      ['HEIC', ftyp('heic', 'mif1', 'heic'), 'image/heic'],
      ['HEIF generic with heic compatible', ftyp('mif1', 'mif1', 'heic'), 'image/heic'],
      ['HEIF generic', ftyp('mif1', 'mif1'), 'image/heif'],
      ['HEIC sequence', ftyp('hevc', 'msf1', 'hevc'), 'image/heic-sequence'],
      // AV1 Image File Format: mif1 with the avif brand is AVIF, not HEIF.
      ['AVIF', ftyp('avif', 'mif1', 'avif'), null],
      ['AVIF under mif1', ftyp('mif1', 'avif'), null],
      ['MP4 video', ftyp('isom', 'isom', 'mp41'), null],
      // ISO 32000-1 §7.5.2: the file header line "%PDF-1.n".
      ['PDF', Buffer.from('%PDF-1.7\n%\xe2\xe3\xcf\xd3\n', 'latin1'), 'application/pdf'],
      ['PNG', minimalPng(), 'image/png'],
      ['JPEG', minimalJpeg(), 'image/jpeg'],
      ['GIF', Buffer.from('GIF89a\x01\x00\x01\x00', 'latin1'), null],
      ['SVG', Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"/>'), null],
      ['HTML', Buffer.from('<!doctype html><script>alert(1)</script>'), null],
      ['PNG cut short', minimalPng().subarray(0, 7), null],
      ['empty', Buffer.alloc(0), null],
    ];
    for (const [name, bytes, type] of table) expect(sniffContentType(bytes), name).toBe(type);
  });

  it('answers multipart mistakes with 4xx in the error format, never a 500, and stores nothing', async () => {
    const before = await attachmentRows();
    const filesBefore = filesUnder(api.uploadsDir);
    const png = minimalPng(6);
    const mistakes: { parts: Part[]; status: number }[] = [
      { parts: [file('a.png', png), file('b.png', png)], status: 400 },
      { parts: [{ name: 'photo', filename: 'a.png', type: 'image/png', bytes: png }], status: 400 },
      { parts: [{ name: 'caption', value: 'no file here' }], status: 400 },
      { parts: [file('a.png', png), { name: 'owner', value: 'me' }], status: 400 },
      { parts: [file('a.png', png), { name: 'caption', value: 'x'.repeat(501) }], status: 400 },
      { parts: [file('a.png', png), { name: 'readingId', value: 'abc' }], status: 400 },
    ];
    for (const { parts, status } of mistakes) {
      const response = await upload('owner', ownJobId, parts);
      expect(response.status, JSON.stringify(response.body)).toBe(status);
      expect(response.body.error.code).toEqual(expect.any(String));
    }
    const truncated = multipart([file('a.png', png)]);
    const cut = await request(api.app)
      .post(`/api/jobs/${ownJobId}/attachments`)
      .set(as(api, 'owner'))
      .set('Content-Type', truncated.contentType)
      .send(truncated.body.subarray(0, truncated.body.length - 30));
    expect(cut.status).toBe(400);
    expect(cut.body.error.code).toBe('bad_request');
    const json = await request(api.app)
      .post(`/api/jobs/${ownJobId}/attachments`)
      .set(as(api, 'owner'))
      .send({ file: 'iVBORw0KGgo=' })
      .expect(415);
    expect(json.body.error.code).toBe('unsupported_media_type');
    await upload('owner', 999_999, [file('a.png', png)]).expect(404);
    expect(await attachmentRows()).toBe(before);
    expect(filesUnder(api.uploadsDir)).toEqual(filesBefore);
  });
});

describe('listing and downloading', () => {
  it('returns the identical bytes with the stored type, a safe Content-Disposition and nosniff', async () => {
    const png = minimalPng(7);
    const created = await upload('helper', ownJobId, [file('Zündkerze.png', png, 'image/jpeg')]).expect(201);
    const response = await download('customer', created.body.url).expect(200);
    // SHA-256 (FIPS 180-4) of what came back equals that of what was sent.
    expect(sha256(response.body as Buffer)).toBe(sha256(png));
    expect(response.headers['content-type']).toBe('image/png');
    expect(response.headers['x-content-type-options']).toBe('nosniff');
    // RFC 6266 §4.3 with RFC 8187 §3.2.1: ü is U+00FC, UTF-8 C3 BC (RFC 3629) — hand encoding.
    expect(response.headers['content-disposition']).toBe(
      `attachment; filename="Z_ndkerze.png"; filename*=UTF-8''Z%C3%BCndkerze.png`,
    );
    expect(response.headers['cache-control']).toBe('private, no-store');

    const pdf = Buffer.from('%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n', 'latin1');
    const receipt = await upload('owner', ownJobId, [file("parts receipt (Tamarack's).pdf", pdf)]).expect(
      201,
    );
    const pdfResponse = await download('owner', receipt.body.url).expect(200);
    expect(sha256(pdfResponse.body as Buffer)).toBe(sha256(pdf));
    expect(pdfResponse.headers['content-type']).toBe('application/pdf');
    // Plain ASCII needs no filename*; the apostrophe and brackets are legal inside the quotes (RFC 9110 §5.6.4).
    expect(pdfResponse.headers['content-disposition']).toBe(
      `attachment; filename="parts receipt (Tamarack's).pdf"`,
    );
  });

  it('pages the list newest first with a cursor', async () => {
    const all = await request(api.app)
      .get(`/api/jobs/${ownJobId}/attachments`)
      .query({ limit: 100 })
      .set(as(api, 'owner'))
      .expect(200);
    const ids = AttachmentListSchema.parse(all.body).items.map((a) => a.id);
    expect(ids.length).toBeGreaterThan(3);
    const seen: number[] = [];
    let cursor: string | null = null;
    do {
      const page = await request(api.app)
        .get(`/api/jobs/${ownJobId}/attachments`)
        .query({ limit: 2, ...(cursor ? { cursor } : {}) })
        .set(as(api, 'helper'))
        .expect(200);
      const parsed = AttachmentListSchema.parse(page.body);
      seen.push(...parsed.items.map((a) => a.id));
      cursor = parsed.nextCursor;
    } while (cursor);
    expect(seen).toEqual(ids);
    expect([...ids].sort((a, b) => b - a)).toEqual(ids);
  });

  it("shows a customer their own jobs' attachments only: another customer's are 404", async () => {
    const theirs = await upload('owner', otherJobId, [file('other.png', minimalPng(8))]).expect(201);
    await request(api.app).get(`/api/jobs/${otherJobId}/attachments`).set(as(api, 'customer')).expect(404);
    await download('customer', theirs.body.url).expect(404);
    // The attachment id under the customer's own job does not reach it either.
    await download('customer', `/api/jobs/${ownJobId}/attachments/${theirs.body.id}/file`).expect(404);
    const own = await request(api.app)
      .get(`/api/jobs/${ownJobId}/attachments`)
      .set(as(api, 'customer'))
      .expect(200);
    expect(own.body.items.length).toBeGreaterThan(0);
    expect(own.body.items.every((a: { jobId: number }) => a.jobId === ownJobId)).toBe(true);
    await upload('customer', ownJobId, [file('mine.png', minimalPng(9))]).expect(403);
    await request(api.app).get(`/api/jobs/${ownJobId}/attachments`).set(as(api, 'bookkeeper')).expect(403);
  });
});

describe('deleting', () => {
  it('is the owner’s, audited, and removes the file only when no other attachment holds the same bytes', async () => {
    const png = minimalPng(10);
    const a = await upload('owner', ownJobId, [file('a.png', png)]).expect(201);
    const b = await upload('helper', otherJobId, [file('b.png', png)]).expect(201);
    const [row] = await api.database.db.select().from(t.attachments).where(eq(t.attachments.id, a.body.id));
    const stored = path.join(api.uploadsDir, row!.storageKey);

    await request(api.app)
      .delete(`/api/jobs/${ownJobId}/attachments/${a.body.id}`)
      .set(as(api, 'helper'))
      .expect(403);
    // Under the wrong job it is not found.
    await request(api.app)
      .delete(`/api/jobs/${ownJobId}/attachments/${b.body.id}`)
      .set(as(api, 'owner'))
      .expect(404);
    await request(api.app)
      .delete(`/api/jobs/${ownJobId}/attachments/${a.body.id}`)
      .set(as(api, 'owner'))
      .expect(204);
    expect(existsSync(stored)).toBe(true);
    const still = await download('owner', b.body.url).expect(200);
    expect(sha256(still.body as Buffer)).toBe(sha256(png));

    await request(api.app)
      .delete(`/api/jobs/${otherJobId}/attachments/${b.body.id}`)
      .set(as(api, 'owner'))
      .expect(204);
    expect(existsSync(stored)).toBe(false);
    await download('owner', b.body.url).expect(404);
    await request(api.app)
      .delete(`/api/jobs/${otherJobId}/attachments/${b.body.id}`)
      .set(as(api, 'owner'))
      .expect(404);

    const audits = await api.database.db
      .select()
      .from(t.auditEvents)
      .where(and(eq(t.auditEvents.action, 'attachment.deleted'), eq(t.auditEvents.entityType, 'attachment')));
    expect(audits.map((e) => e.entityId)).toEqual(
      expect.arrayContaining([String(a.body.id), String(b.body.id)]),
    );
  });
});
