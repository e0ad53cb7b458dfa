/**
 * Property-based fuzzing of every JSON write body the API takes (issue "Proof"): for each POST,
 * PATCH and PUT the app serves, fast-check (fixed seed) sends bodies grown from the route's valid
 * access-matrix body — fields swapped for hostile values, dropped, added, nested ones mangled —
 * and whole bodies of the wrong shape. No answer may be a 5xx; every 4xx must be in the error
 * format and leave every table exactly as it was.
 */
import type { Server } from 'node:http';
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, seededApi, type Caller, type TestApi } from '../helpers/api';
import { loadFixtures } from '../server/access/fixtures';
import { accessRows, appRoutes, tableWatch, targetFor, type AppRoute } from './routes';

/** fast-check's seed: a fixed one, so a failure here is the same failure on every machine. */
const SEED = 20_261_118;
/** Bodies per route: ~30 routes × this stays within a few seconds. */
const RUNS_PER_ROUTE = 6;

const DROP = Symbol('drop');

/** Values that break careless code: limits of int4/int8/float, NUL, lone surrogates, odd dates. */
const hostileString = fc.constantFrom(
  '',
  ' ',
  '\u0000',
  'a\u0000b',
  '\ud800',
  '\u202e',
  '0',
  '-1',
  '1e400',
  'NaN',
  'Infinity',
  'null',
  'true',
  '[]',
  '{}',
  '__proto__',
  'constructor',
  '2026-02-30',
  '2026-13-01',
  '0000-01-01',
  '275760-09-13',
  '9999-12-31T23:59:59.999Z',
  '2026-11-18T25:00:00Z',
  '1970-01-01T00:00:00+23:59',
  "'; drop table jobs; --",
  '<script>alert(1)</script>',
  '../../etc/passwd',
  '43psi',
  '-43psi',
  '1e308 psi',
  '0x1A V',
  'x'.repeat(5_001),
);
const hostileNumber = fc.oneof(
  fc.integer(),
  fc.double({ noNaN: false }),
  fc.constantFrom(
    0,
    -0,
    -1,
    0.5,
    1e-7,
    2 ** 31 - 1,
    2 ** 31,
    -(2 ** 31) - 1,
    2 ** 53,
    2 ** 63,
    -(2 ** 63),
    1e21,
    1e308,
    -1e308,
  ),
);
const leaf = fc.oneof(
  hostileString,
  fc.string({ unit: 'binary', maxLength: 12 }),
  hostileNumber,
  fc.boolean(),
  fc.constant(null),
);
const anyValue = fc.oneof(
  { weight: 4, arbitrary: leaf },
  { weight: 1, arbitrary: fc.array(leaf, { maxLength: 3 }) },
  { weight: 1, arbitrary: fc.dictionary(fc.string({ maxLength: 6 }), leaf, { maxKeys: 3 }) },
);

/** Field names of the API, so added fields are ones some route actually reads. */
const FIELD_NAMES = [
  'id',
  'businessId',
  'business_id',
  'customerId',
  'machineId',
  'jobId',
  'clientId',
  'status',
  'role',
  'password',
  'email',
  'amountCents',
  'unitPriceCents',
  'quantity',
  'value',
  'unit',
  'takenAt',
  'steps',
  'answer',
];

/** A value like `seed`, each part kept, replaced by a hostile value, or (in an object) dropped. */
function mutated(seed: unknown, depth = 0): fc.Arbitrary<unknown> {
  const replaced = depth > 3 ? anyValue : fc.oneof(anyValue, fc.constant(seed));
  if (Array.isArray(seed)) {
    return fc.oneof(
      { weight: 3, arbitrary: fc.tuple(...seed.map((item) => mutated(item, depth + 1))) },
      { weight: 1, arbitrary: replaced },
    );
  }
  if (seed !== null && typeof seed === 'object') {
    const entries = Object.entries(seed as Record<string, unknown>);
    const fields = fc.tuple(
      ...entries.map(([, value]) =>
        fc.oneof(
          { weight: 2, arbitrary: fc.constant(value) },
          { weight: 3, arbitrary: mutated(value, depth + 1) },
          { weight: 1, arbitrary: fc.constant(DROP) },
        ),
      ),
    );
    const extra = fc.dictionary(fc.constantFrom(...FIELD_NAMES), anyValue, { maxKeys: depth === 0 ? 2 : 1 });
    return fc.oneof(
      {
        weight: 4,
        arbitrary: fc.tuple(fields, extra).map(([values, added]) => {
          const out: Record<string, unknown> = {};
          entries.forEach(([key], i) => {
            if (values[i] !== DROP) out[key] = values[i];
          });
          return { ...added, ...out };
        }),
      },
      { weight: 1, arbitrary: replaced },
    );
  }
  return replaced;
}

/** A route's bodies: mostly mutations of its valid body, some of no shape at all. */
const bodiesFor = (valid: unknown) =>
  fc.oneof(
    { weight: 5, arbitrary: mutated(valid ?? {}) },
    { weight: 1, arbitrary: fc.dictionary(fc.constantFrom(...FIELD_NAMES), anyValue, { maxKeys: 4 }) },
    { weight: 1, arbitrary: anyValue },
  );

/**
 * A refused sign-in is recorded for the owner to see (`auth.sign_in_failed` in the audit log,
 * server/services/auth.ts): that row is the point of refusing, not data the request stored.
 */
const ALLOWED_ON_REFUSAL: Record<string, string[]> = { 'POST /api/auth/sign-in': ['audit_events'] };

/**
 * 503 with a `…_not_set_up` code is the app saying a feature is switched off on this server (mail
 * without SMTP, card payments without their keys): a refusal like a 4xx, not a failure.
 */
const notSetUp = (response: { status: number; body?: { error?: { code?: unknown } } }) =>
  response.status === 503 && /_not_set_up$/.test(String(response.body?.error?.code));

let api: TestApi;
/** One listening server for the whole walk (supertest would start one per request). */
let server: Server;
interface Target {
  route: AppRoute;
  path: string;
  body: unknown;
  caller: Caller;
}
let targets: Target[];

beforeAll(async () => {
  api = await seededApi();
  server = api.app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  const fixtures = await loadFixtures(api);
  const rows = accessRows();
  targets = [];
  for (const route of appRoutes(api.app).filter((r) => ['post', 'patch', 'put'].includes(r.method))) {
    // Sign-out ends the caller's session: fuzzed signed out, it has no session to end.
    if (route.pattern === '/api/auth/sign-out') {
      targets.push({ route, path: route.pattern, body: {}, caller: 'anonymous' });
      continue;
    }
    if (route.pattern === '/api/auth/sign-in') {
      targets.push({
        route,
        path: route.pattern,
        body: { email: 'owner@ridgeback.test', password: 'not-the-password' },
        caller: 'anonymous',
      });
      continue;
    }
    const target = await targetFor(rows, route, fixtures);
    // A route no access row names fails the access-matrix test; here it is still fuzzed, on id 1.
    targets.push(
      target
        ? { route, ...target }
        : { route, path: route.pattern.replace(/:[a-z]+/gi, '1'), body: {}, caller: 'owner' },
    );
  }
});
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  await api.close();
});

describe('fuzzed write bodies', () => {
  it('covers every POST, PATCH and PUT the app serves', () => {
    const names = targets.map((t) => `${t.route.method.toUpperCase()} ${t.route.pattern}`);
    // The list comes from the app; these are a few it must contain, or the walk found nothing.
    expect(names).toEqual(
      expect.arrayContaining([
        'POST /api/auth/sign-in',
        'POST /api/customers',
        'PATCH /api/jobs/:id',
        'POST /api/jobs/:id/readings',
        'POST /api/invoices/:id/payments',
        'PATCH /api/trips/:id',
      ]),
    );
    expect(names.length).toBeGreaterThanOrEqual(30);
  });

  it('answer no 5xx, and store nothing on a 4xx', async () => {
    const problems: string[] = [];
    const watch = await tableWatch(api.database.db);
    for (const [index, target] of targets.entries()) {
      const route = `${target.route.method.toUpperCase()} ${target.route.pattern}`;
      // Empty bodies first (a PATCH with nothing in it once reached the database as an empty
      // UPDATE: a 500), then the sampled ones.
      const bodies = [
        {},
        [],
        ...fc.sample(bodiesFor(target.body), { seed: SEED + index, numRuns: RUNS_PER_ROUTE }),
      ];
      for (const body of bodies) {
        const json = JSON.stringify(body) ?? 'null';
        await watch.settle();
        const call = request(server)[target.route.method](target.path);
        const response = await call
          .set(as(api, target.caller))
          .set('Content-Type', 'application/json')
          .send(json);
        const where = `${target.route.method.toUpperCase()} ${target.path} as ${target.caller} ${json.slice(0, 300)}`;
        const refused = response.status >= 400 && !(response.status >= 500 && !notSetUp(response));
        if (!refused && response.status >= 500) {
          problems.push(`${response.status} ${where}: ${response.text.slice(0, 200)}`);
        }
        if (refused) {
          const changed = (await watch.changedSince()).filter(
            (table) => !ALLOWED_ON_REFUSAL[route]?.includes(table),
          );
          if (changed.length > 0)
            problems.push(`${response.status} stored in ${changed.join(', ')}: ${where}`);
          if (
            typeof response.body?.error?.code !== 'string' ||
            typeof response.body.error.message !== 'string'
          )
            problems.push(
              `${response.status} not in the error format: ${where}: ${response.text.slice(0, 200)}`,
            );
        }
      }
    }
    expect(problems).toEqual([]);
  }, 60_000);
});
