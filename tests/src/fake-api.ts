import { vi } from 'vitest';
import type { SessionUser } from '../../shared/api/auth';
import type { Role } from '../../shared/api/users';
import { jsonResponse } from './render-app';

/** One fake endpoint: gets the request, answers as the server would. */
export type FakeRoute = (request: {
  url: URL;
  init: RequestInit | undefined;
}) => Response | Promise<Response>;

/**
 * Replaces fetch with a table of "METHOD /path" → answer. Anything not in the table answers the
 * API's 404 error body, so a page asking for something unexpected shows up as a failure, not a hang.
 */
export function fakeApi(routes: Record<string, FakeRoute>) {
  const fetchMock = vi.fn<typeof fetch>(async (input, init) => {
    const url = new URL(String(input), 'http://vanbay.test');
    const route = routes[`${init?.method ?? 'GET'} ${url.pathname}`];
    if (!route) {
      return jsonResponse(404, {
        error: { code: 'not_found', message: `No such API route ${url.pathname}` },
      });
    }
    return route({ url, init });
  });
  vi.stubGlobal('fetch', fetchMock);
  return fetchMock;
}

/** The seeded demo sign-ins (CONTRACT.md, "Demo sign-ins"), as /api/auth/me would describe them. */
export const demoUsers: Record<Role, SessionUser> = {
  owner: { id: 1, email: 'owner@ridgeback.test', role: 'owner', name: 'Morgan Avery', customerId: null },
  helper: { id: 2, email: 'helper@ridgeback.test', role: 'helper', name: 'Dana Whitlock', customerId: null },
  bookkeeper: {
    id: 3,
    email: 'books@ridgeback.test',
    role: 'bookkeeper',
    name: 'Priya Lindqvist',
    customerId: null,
  },
  customer: { id: 4, email: 'jules@example.test', role: 'customer', name: 'Jules Marchetti', customerId: 1 },
};

export const healthy: Record<string, FakeRoute> = {
  'GET /api/health': () => jsonResponse(200, { ok: true }),
};

export const unauthorized = () =>
  jsonResponse(401, { error: { code: 'unauthorized', message: 'Sign in first.' } });

/**
 * Health plus /me: signed in as `who`, or signed out (401) for null. A function is asked on every
 * request, so a test can end the session under the page.
 */
export function session(who: Role | null | (() => Role | null)): Record<string, FakeRoute> {
  return {
    ...healthy,
    'GET /api/auth/me': () => {
      const role = typeof who === 'function' ? who() : who;
      return role ? jsonResponse(200, { user: demoUsers[role] }) : unauthorized();
    },
  };
}

/** The paths fetched so far, with their query strings, in order. */
export function requestedPaths(fetchMock: ReturnType<typeof fakeApi>): string[] {
  return fetchMock.mock.calls.map(([input]) => {
    const url = new URL(String(input), 'http://vanbay.test');
    return `${url.pathname}${url.search}`;
  });
}
