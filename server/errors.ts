/**
 * Domain errors. Services throw these; the one error middleware in app.ts turns them into the
 * error body of CONTRACT.md with their status. Anything else is a 500 with no detail leaked.
 */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

export class BadRequestError extends HttpError {
  constructor(message: string, details?: unknown) {
    super(400, 'bad_request', message, details);
  }
}

export class NotFoundError extends HttpError {
  constructor(message = 'Not found') {
    super(404, 'not_found', message);
  }
}

export class ConflictError extends HttpError {
  constructor(message: string, details?: unknown) {
    super(409, 'conflict', message, details);
  }
}

export class UnauthorizedError extends HttpError {
  constructor(message = 'Sign in first.', code = 'unauthorized') {
    super(401, code, message);
  }
}

export class ForbiddenError extends HttpError {
  constructor(message = 'Your role may not do this.') {
    super(403, 'forbidden', message);
  }
}
