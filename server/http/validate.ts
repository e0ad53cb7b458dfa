import type { z } from 'zod';
import { BadRequestError } from '../errors';

/**
 * Parses a request part with its shared schema; a mismatch is a 400 naming each field and what
 * was wrong with it, and nothing has been touched yet.
 */
export function parse<S extends z.ZodType>(schema: S, value: unknown, part = 'body'): z.infer<S> {
  const result = schema.safeParse(value);
  if (result.success) return result.data;
  const issues = result.error.issues.map((issue) => ({
    path: issue.path.join('.'),
    message: issue.message,
  }));
  const first = issues[0];
  const where = first?.path ? `${first.path}: ` : '';
  throw new BadRequestError(`Invalid ${part}: ${where}${first?.message ?? 'not accepted'}`, issues);
}
