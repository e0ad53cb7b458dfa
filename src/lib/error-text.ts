import { z } from 'zod';
import { ApiError } from './api-client';

/**
 * One sentence for a failed request, for the alert beside the control that made it. `forbidden`
 * names who may do it, since a 403 on a page someone could open means their role stops there.
 */
export function errorText(error: Error, { forbidden }: { forbidden?: string } = {}): string {
  if (error instanceof ApiError) {
    if (error.status === 0) {
      return 'The Vanbay server did not answer. Check that it is running (npm start), then try again.';
    }
    if (error.status === 401) return 'Your sign-in has ended. Sign in again to carry on.';
    if (error.status === 403 && forbidden) return forbidden;
    // A 4xx message says what to fix (the field, the conflict); a 5xx one is the server's own trouble.
    if (error.status >= 500) return `The server could not do this (${error.status}): ${error.message}`;
    return error.message;
  }
  return error.message;
}

/** A 400's `details` as the server writes them (server/http/validate.ts): one entry per field. */
const FieldIssuesSchema = z.array(z.object({ path: z.string(), message: z.string() }));

/**
 * The field-by-field reasons a 400 carries, as [field path, message] pairs, so a form can put each
 * beside its own field; none for any other failure.
 */
export function fieldErrorsOf(error: Error): Array<[path: string, message: string]> {
  if (!(error instanceof ApiError) || error.status !== 400) return [];
  const issues = FieldIssuesSchema.safeParse(error.details);
  return issues.success ? issues.data.map((issue): [string, string] => [issue.path, issue.message]) : [];
}

/**
 * A send refused because a mail for the same thing never went but waits in the outbox (409 with
 * `details.waiting`): the server retries it on its own, and a send with `again` tries it at once.
 */
export function isWaitingMail(error: unknown): boolean {
  if (!(error instanceof ApiError) || error.status !== 409) return false;
  return (error.details as { waiting?: unknown } | undefined)?.waiting === true;
}
