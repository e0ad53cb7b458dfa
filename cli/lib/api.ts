/**
 * The CLI's one way to the server: JSON in and out, every answer parsed with the shared schema,
 * errors turned into one-line messages (exit 1: the server said no) and an unreachable server into
 * an `UnreachableError` the offline queue can catch.
 */
import type { z } from 'zod';
import { ErrorBodySchema } from '../../shared/api/errors';
import { resolveServer, UsageError, type CliDeps } from './deps';
import { resolveToken } from './session-store';

export class ApiError extends Error {
  override name = 'ApiError';
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

/** The server could not be reached at all (refused, timed out, DNS): nothing was done. */
export class UnreachableError extends Error {
  override name = 'UnreachableError';
}

export interface Api {
  server: string;
  request<S extends z.ZodType>(
    method: string,
    path: string,
    schema: S,
    options?: { body?: unknown; query?: Record<string, string | number | undefined> },
  ): Promise<z.infer<S>>;
}

export function createApi(
  deps: CliDeps,
  serverFlag: string | undefined,
  options: { token?: string | null } = {},
): Api {
  const server = resolveServer(serverFlag, deps.env);
  try {
    new URL(server);
  } catch {
    throw new UsageError(`"${server}" is not a server URL (try http://localhost:5180)`);
  }
  const token = options.token === undefined ? resolveToken(deps.env, server) : options.token;
  return {
    server,
    async request(method, path, schema, { body, query } = {}) {
      const url = new URL(path, server);
      for (const [key, value] of Object.entries(query ?? {})) {
        if (value !== undefined) url.searchParams.set(key, String(value));
      }
      let response: Response;
      try {
        response = await deps.fetch(url, {
          method,
          headers: {
            accept: 'application/json',
            ...(body === undefined ? {} : { 'content-type': 'application/json' }),
            ...(token ? { authorization: `Bearer ${token}` } : {}),
          },
          body: body === undefined ? undefined : JSON.stringify(body),
          signal: AbortSignal.timeout(15_000),
        });
      } catch (error) {
        throw new UnreachableError(
          `cannot reach ${server}: ${error instanceof Error ? error.message : String(error)}`,
        );
      }
      const text = await response.text();
      const json: unknown = text ? safeJson(text) : undefined;
      if (!response.ok) {
        const parsed = ErrorBodySchema.safeParse(json);
        const code = parsed.success ? parsed.data.error.code : 'http_error';
        if (response.status === 401 && (code === 'invalid_token' || code === 'unauthorized')) {
          throw new ApiError(
            401,
            code,
            token
              ? 'your session has ended: sign in again with `vanbay login`'
              : 'not signed in: run `vanbay login` first (or set VANBAY_TOKEN)',
          );
        }
        throw new ApiError(
          response.status,
          parsed.success ? parsed.data.error.code : 'http_error',
          parsed.success ? parsed.data.error.message : `the server answered HTTP ${response.status}`,
        );
      }
      const parsed = schema.safeParse(json);
      if (!parsed.success)
        throw new ApiError(response.status, 'unexpected_answer', `unexpected answer from ${server}${path}`);
      return parsed.data;
    },
  };
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}
