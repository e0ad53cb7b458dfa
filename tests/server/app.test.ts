import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '../../shared/api/errors';
import { HealthSchema } from '../../shared/api/health';
import { createApp } from '../../server/app';
import type { Database } from '../../server/db/client';
import { cloneDatabase, tempUploadsDir } from '../helpers/db';

describe('the app shell', () => {
  let database: Database;
  let app: ReturnType<typeof createApp>;
  let clientDir: string;
  beforeAll(async () => {
    database = await cloneDatabase('seeded');
    clientDir = mkdtempSync(path.join(tmpdir(), 'vanbay-client-'));
    writeFileSync(path.join(clientDir, 'index.html'), '<!doctype html><title>Vanbay shell</title>');
    writeFileSync(path.join(clientDir, 'app.js'), 'console.log("asset")');
    app = createApp({ db: database.db, clientDir, uploadsDir: tempUploadsDir() });
  });
  afterAll(() => database.close());

  it('answers GET /api/health with {"ok": true} and no sign-in', async () => {
    const response = await request(app).get('/api/health').expect(200);
    expect(HealthSchema.parse(response.body)).toEqual({ ok: true });
  });

  it('answers an unknown API route with 404 in the error format', async () => {
    const response = await request(app).get('/api/no-such-thing').expect(404);
    expect(ErrorBodySchema.parse(response.body).error.code).toBe('not_found');
    expect(response.headers['content-type']).toMatch(/json/);
  });

  it('answers a malformed JSON body with 400 in the error format', async () => {
    const response = await request(app)
      .post('/api/health')
      .set('content-type', 'application/json')
      .send('{"value": 43psi}')
      .expect(400);
    const body = ErrorBodySchema.parse(response.body);
    expect(body.error.code).toBe('malformed_json');
    expect(body.error.message).toMatch(/not valid JSON/);
  });

  it('refuses a body over the limit with 413 in the error format', async () => {
    const response = await request(app)
      .post('/api/health')
      .set('content-type', 'application/json')
      .send(JSON.stringify({ note: 'x'.repeat(200 * 1024) }))
      .expect(413);
    expect(ErrorBodySchema.parse(response.body).error.code).toBe('body_too_large');
  });

  it('serves the dashboard shell for client routes and its assets as files', async () => {
    const page = await request(app).get('/jobs/42').expect(200);
    expect(page.text).toContain('Vanbay shell');
    const asset = await request(app).get('/app.js').expect(200);
    expect(asset.text).toContain('asset');
  });

  it('does not answer API paths with the dashboard shell', async () => {
    const response = await request(app).get('/api/no-such-route/42').expect(404);
    expect(response.text).not.toContain('Vanbay shell');
  });

  it('says it is not healthy once the database is gone', async () => {
    const lost = await cloneDatabase('empty');
    const orphan = createApp({ db: lost.db, uploadsDir: tempUploadsDir() });
    await lost.close();
    const response = await request(orphan).get('/api/health').expect(503);
    expect(response.body).toEqual({ ok: false });
  });
});
