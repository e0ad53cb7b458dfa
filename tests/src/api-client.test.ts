// @vitest-environment jsdom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ApiError, request } from '../../src/lib/api-client';
import { jsonResponse } from './render-app';

afterEach(() => {
  vi.unstubAllGlobals();
});

const ThingSchema = z.object({ id: z.string(), count: z.number() });

function answerWith(response: Response | (() => Promise<Response>)) {
  const fetchMock = vi.fn<typeof fetch>(typeof response === 'function' ? response : async () => response);
  vi.stubGlobal('fetch', fetchMock);
  return fetchMock;
}

async function caught(promise: Promise<unknown>): Promise<ApiError> {
  const error: unknown = await promise.then(
    () => undefined,
    (reason: unknown) => reason,
  );
  if (!(error instanceof ApiError)) throw new Error(`expected an ApiError, got ${String(error)}`);
  return error;
}

describe('request', () => {
  it('returns the body parsed by the schema and sends the session cookie', async () => {
    const fetchMock = answerWith(jsonResponse(200, { id: 't1', count: 3, extra: 'dropped' }));

    await expect(request('/api/things/t1', ThingSchema)).resolves.toEqual({ id: 't1', count: 3 });
    const init = fetchMock.mock.calls[0]?.[1];
    expect(init?.credentials).toBe('include');
  });

  it('throws an ApiError carrying the status, code and message of a 4xx error body', async () => {
    answerWith(
      jsonResponse(403, {
        error: { code: 'forbidden', message: 'Helpers cannot see rates', details: { role: 'helper' } },
      }),
    );

    const error = await caught(request('/api/settings', ThingSchema));
    expect(error.status).toBe(403);
    expect(error.code).toBe('forbidden');
    expect(error.message).toBe('Helpers cannot see rates');
    expect(error.details).toEqual({ role: 'helper' });
  });

  it('throws when a 2xx body does not match the schema', async () => {
    answerWith(jsonResponse(200, { id: 't1', count: 'three' }));

    const error = await caught(request('/api/things/t1', ThingSchema));
    expect(error.status).toBe(200);
    expect(error.code).toBe('invalid_response');
  });

  it('throws a readable ApiError when an error answer is not the API’s error shape', async () => {
    answerWith(new Response('<html>Bad Gateway</html>', { status: 502 }));

    const error = await caught(request('/api/things', ThingSchema));
    expect(error.status).toBe(502);
    expect(error.code).toBe('unreadable_error_body');
  });

  it('throws an ApiError with status 0 when no answer arrives', async () => {
    answerWith(async () => {
      throw new TypeError('fetch failed');
    });

    const error = await caught(request('/api/things', ThingSchema));
    expect(error.status).toBe(0);
    expect(error.code).toBe('network_error');
    expect(error.cause).toBeInstanceOf(TypeError);
  });
});
