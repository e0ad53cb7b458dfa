/**
 * The role × route matrix: every API route, for the four roles and the signed-out caller, with
 * the status each must get (issue: "in one table"). The rows live beside this file, one list per
 * part of the API; this runner proves them all against a seeded app.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, seededApi, type TestApi } from '../helpers/api';
import { backupRows } from './access/backup';
import { businessRows } from './access/business';
import { careRows } from './access/care';
import { coreRows } from './access/core';
import { documentRows } from './access/documents';
import { loadFixtures } from './access/fixtures';
import { mailRows } from './access/mail';
import { jobRecordRows } from './access/job-records';
import { moneyRows } from './access/money';
import { CALLERS, type Fixtures } from './access/types';
import { workshopRows } from './access/workshop';

const ROWS = [
  ...coreRows,
  ...workshopRows,
  ...jobRecordRows,
  ...moneyRows,
  ...careRows,
  ...documentRows,
  ...mailRows,
  ...backupRows,
  ...businessRows,
];

let api: TestApi;
let fixtures: Fixtures;
beforeAll(async () => {
  api = await seededApi();
  fixtures = await loadFixtures(api);
});
afterAll(() => api.close());

describe.each(ROWS)('$name', (row) => {
  it.each(CALLERS)('as %s', async (caller) => {
    const path = await row.path(fixtures, caller);
    let call = request(api.app)[row.method](path).set(as(api, caller));
    const body = row.body?.(fixtures, caller);
    if (body !== undefined) call = call.send(body as object);
    const response = await call;
    expect(
      response.status,
      `${row.method.toUpperCase()} ${path} as ${caller}: ${JSON.stringify(response.body)}`,
    ).toBe(row.expect[caller]);
    if (response.status >= 400) expect(response.body.error).toMatchObject({ code: expect.any(String) });
  });
});

describe('the matrix covers the API', () => {
  it('has a row for every route the app serves', () => {
    const routes = new Set<string>();
    const stack = (api.app as unknown as { router: { stack: Layer[] } }).router.stack;
    collectRoutes(stack, routes);
    const covered = new Set(ROWS.map((r) => `${r.method.toUpperCase()} ${routeOf(r.name)}`));
    const missing = [...routes]
      .map((route) => route.replace(/:[a-z]+/gi, ':id'))
      .filter((route) => route.includes('/api/') && !route.endsWith('/api/health'))
      // Sign-in and sign-out would end the shared sessions; tests/server/auth.test.ts covers them.
      .filter((route) => !covered.has(route) && !route.includes('/api/auth/sign-'));
    expect(missing).toEqual([]);
  });
});

interface Layer {
  route?: { path: string; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
}

function collectRoutes(stack: Layer[], into: Set<string>) {
  for (const layer of stack) {
    if (layer.route) {
      for (const method of Object.keys(layer.route.methods))
        into.add(`${method.toUpperCase()} ${layer.route.path}`);
    } else if (layer.handle?.stack) {
      collectRoutes(layer.handle.stack, into);
    }
  }
}

/** A row's name starts with its method and route pattern, the ids written as `:own`, `:id` … */
function routeOf(name: string): string {
  const path = name.split(' ')[1] ?? '';
  return path.replace(/:[a-z]+/gi, ':id');
}
