import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SESSION_TTL_SECONDS } from '../../server/auth/tokens';
import { DEMO_PASSWORD } from '../../server/db/seed-data';
import { as, seededApi, type TestApi } from '../helpers/api';

let api: TestApi;
beforeAll(async () => {
  api = await seededApi();
});
afterAll(() => api.close());

describe('sign-in, sessions and sign-out', () => {
  it('signs in with the demo password and answers the contract shape, with an httpOnly cookie', async () => {
    const response = await request(api.app)
      .post('/api/auth/sign-in')
      .send({ email: 'owner@ridgeback.test', password: DEMO_PASSWORD })
      .expect(200);
    expect(response.body).toEqual({
      token: expect.any(String),
      user: {
        id: expect.any(Number),
        email: 'owner@ridgeback.test',
        role: 'owner',
        name: 'Morgan Avery',
        customerId: null,
      },
    });
    const cookie = String(response.headers['set-cookie']);
    expect(cookie).toMatch(/vanbay_session=/);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Strict/);
  });

  it('refuses a wrong password and an unknown address alike, with 401', async () => {
    for (const body of [
      { email: 'owner@ridgeback.test', password: 'nope' },
      { email: 'nobody@ridgeback.test', password: DEMO_PASSWORD },
    ]) {
      const response = await request(api.app).post('/api/auth/sign-in').send(body).expect(401);
      expect(response.body.error).toEqual({ code: 'bad_credentials', message: 'Wrong e-mail or password.' });
    }
  });

  it('accepts the cookie from the browser as well as the Bearer token from the CLI', async () => {
    const agent = request.agent(api.app);
    await agent.post('/api/auth/sign-in').send({ email: 'books@ridgeback.test', password: DEMO_PASSWORD });
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.user.role).toBe('bookkeeper');
    const bearer = await request(api.app).get('/api/auth/me').set(as(api, 'helper')).expect(200);
    expect(bearer.body.user.role).toBe('helper');
  });

  it('answers 401 without a session, and for tampered, foreign and expired tokens', async () => {
    await request(api.app).get('/api/auth/me').expect(401);
    const [head, body, signature] = api.tokens.owner.split('.');
    const payload = JSON.parse(Buffer.from(body!, 'base64url').toString()) as Record<string, unknown>;
    const forged = Buffer.from(JSON.stringify({ ...payload, sub: '999' })).toString('base64url');
    await request(api.app)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${head}.${forged}.${signature}`)
      .expect(401);
    await request(api.app).get('/api/auth/me').set('Authorization', 'Bearer not-a-token').expect(401);
    api.clock.set(new Date(api.clock.now.getTime() + (SESSION_TTL_SECONDS + 60) * 1000));
    try {
      const expired = await request(api.app).get('/api/auth/me').set(as(api, 'owner')).expect(401);
      expect(expired.body.error.code).toBe('invalid_token');
    } finally {
      api.clock.set(new Date(api.clock.now.getTime() - (SESSION_TTL_SECONDS + 60) * 1000));
    }
  });

  it('ends the session on sign-out: the same token is refused afterwards', async () => {
    const { body } = await request(api.app)
      .post('/api/auth/sign-in')
      .send({ email: 'helper@ridgeback.test', password: DEMO_PASSWORD })
      .expect(200);
    const auth = { Authorization: `Bearer ${body.token as string}` };
    await request(api.app).post('/api/auth/sign-out').set(auth).expect(204);
    await request(api.app).get('/api/auth/me').set(auth).expect(401);
    // Other sessions of the same person stay signed in.
    await request(api.app).get('/api/auth/me').set(as(api, 'helper')).expect(200);
  });

  it('refuses a cookie-authenticated write from another site', async () => {
    const agent = request.agent(api.app);
    await agent.post('/api/auth/sign-in').send({ email: 'owner@ridgeback.test', password: DEMO_PASSWORD });
    await agent
      .post('/api/customers')
      .set('Origin', 'https://elsewhere.example')
      .send({ name: 'X' })
      .expect(403);
    await agent.post('/api/customers').set('Sec-Fetch-Site', 'cross-site').send({ name: 'X' }).expect(403);
  });

  it('rate-limits failed sign-ins per account, with Retry-After, and lets the right password through later', async () => {
    const email = 'jules@example.test';
    for (let i = 0; i < 5; i += 1) {
      await request(api.app).post('/api/auth/sign-in').send({ email, password: 'wrong' }).expect(401);
    }
    const limited = await request(api.app)
      .post('/api/auth/sign-in')
      .send({ email, password: DEMO_PASSWORD })
      .expect(429);
    expect(limited.body.error.code).toBe('rate_limited');
    expect(Number(limited.headers['retry-after'])).toBeGreaterThan(0);
    api.clock.set(new Date(api.clock.now.getTime() + 16 * 60_000));
    await request(api.app).post('/api/auth/sign-in').send({ email, password: DEMO_PASSWORD }).expect(200);
  });

  it('changes the own password: other sessions end, this one gets a new token', async () => {
    const first = await request(api.app)
      .post('/api/auth/sign-in')
      .send({ email: 'books@ridgeback.test', password: DEMO_PASSWORD })
      .expect(200);
    const old = { Authorization: `Bearer ${first.body.token as string}` };
    await request(api.app)
      .post('/api/auth/password')
      .set(old)
      .send({ currentPassword: 'wrong', newPassword: 'a-long-new-password' })
      .expect(400);
    const changed = await request(api.app)
      .post('/api/auth/password')
      .set(old)
      .send({ currentPassword: DEMO_PASSWORD, newPassword: 'a-long-new-password' })
      .expect(200);
    await request(api.app).get('/api/auth/me').set(old).expect(401);
    await request(api.app)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${changed.body.token as string}`)
      .expect(200);
    await request(api.app)
      .post('/api/auth/sign-in')
      .send({ email: 'books@ridgeback.test', password: 'a-long-new-password' })
      .expect(200);
  });
});
