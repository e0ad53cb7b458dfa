import type { z } from 'zod';

/**
 * A schema, or a function that imports one. The frame's few requests (who is signed in, sign-in,
 * sign-out) pass the function, so zod is not part of the first load: it is fetched beside the
 * first request and is there when the answer is. Pages import their schemas directly.
 */
export type SchemaSource<Schema extends z.ZodType> = Schema | (() => Promise<Schema>);

const loadErrorBodySchema = () => import('../../shared/api/errors').then((m) => m.ErrorBodySchema);

/**
 * Codes the client itself assigns when there is no usable error body to read one from. Server codes
 * come from the body and pass through untouched.
 */
export const CLIENT_ERROR_CODES = {
  /** fetch itself failed: no server, no network, or the connection dropped. */
  network: 'network_error',
  /** A non-2xx answer whose body is not the API's error shape (a proxy page, an empty 502). */
  unreadableError: 'unreadable_error_body',
  /** A 2xx answer that does not match the schema the caller expects. */
  invalidResponse: 'invalid_response',
} as const;

export class ApiError extends Error {
  override readonly name = 'ApiError';

  constructor(
    /** The HTTP status; 0 when no answer arrived at all. */
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
    options?: ErrorOptions,
  ) {
    super(message, options);
  }
}

/** The `init` of a write that sends `body` as JSON; no body at all when it is undefined. */
export function jsonInit(method: 'POST' | 'PATCH' | 'PUT' | 'DELETE', body?: unknown): RequestInit {
  return {
    method,
    headers: { 'Content-Type': 'application/json' },
    ...(body === undefined ? {} : { body: JSON.stringify(body) }),
  };
}

/**
 * Fetches an API path and returns the body parsed by `schema`, or throws an `ApiError`. Cookies go
 * along because the session lives in an httpOnly cookie the page cannot read.
 */
export async function request<Schema extends z.ZodType>(
  path: string,
  schema: SchemaSource<Schema>,
  init: RequestInit = {},
): Promise<z.output<Schema>> {
  // Started with the request, not after it, so a schema still to be fetched costs no extra wait.
  const schemas = Promise.all([typeof schema === 'function' ? schema() : schema, loadErrorBodySchema()]);
  // Awaited only once the answer is in; a request that fails first must not leave it unhandled.
  void schemas.catch(() => undefined);
  const headers = new Headers(init.headers);
  if (!headers.has('Accept')) headers.set('Accept', 'application/json');

  let response: Response;
  try {
    response = await fetch(path, { ...init, headers, credentials: 'include' });
  } catch (error) {
    // A cancelled request is the caller's own doing (TanStack Query aborts on unmount); keep it as is.
    if (init.signal?.aborted) throw error;
    throw new ApiError(0, CLIENT_ERROR_CODES.network, `No answer from the server for ${path}`, undefined, {
      cause: error,
    });
  }

  const body = await readJson(response);
  const [answerSchema, ErrorBodySchema] = await schemas;

  if (!response.ok) {
    const parsed = ErrorBodySchema.safeParse(body.ok ? body.value : undefined);
    if (parsed.success) {
      const { code, message, details } = parsed.data.error;
      throw new ApiError(response.status, code, message, details);
    }
    throw new ApiError(
      response.status,
      CLIENT_ERROR_CODES.unreadableError,
      `The server answered ${response.status} for ${path} without a readable error`,
    );
  }

  const parsed = answerSchema.safeParse(body.ok ? body.value : undefined);
  if (!parsed.success) {
    throw new ApiError(
      response.status,
      CLIENT_ERROR_CODES.invalidResponse,
      `The answer for ${path} is not in the expected shape`,
      parsed.error.issues,
    );
  }
  return parsed.data;
}

type JsonRead = { ok: true; value: unknown } | { ok: false };

/** An empty body reads as `undefined` (a 204 is a valid answer); text that is not JSON is a failure. */
async function readJson(response: Response): Promise<JsonRead> {
  const text = await response.text();
  if (text === '') return { ok: true, value: undefined };
  try {
    return { ok: true, value: JSON.parse(text) as unknown };
  } catch {
    return { ok: false };
  }
}
