import { z } from 'zod';
import { ApiError } from '../../../lib/api-client';

/** The server puts the wait in the 429's details (server/services/auth.ts, RateLimitedError). */
const RateLimitDetailsSchema = z.object({ retryAfterSeconds: z.number().positive() });

/** What to tell the person at the sign-in form, in words that say what to do next. */
export function signInErrorMessage(error: Error): string {
  if (!(error instanceof ApiError)) return `Signing in failed: ${error.message}`;
  switch (error.status) {
    case 401:
      return 'That e-mail and password do not match a Vanbay sign-in. Check both and try again.';
    case 429:
      return `Too many failed sign-ins for this account. Wait ${waitText(error.details)}, then try again.`;
    case 400:
      return 'Enter the e-mail address and the password of your Vanbay sign-in.';
    case 0:
      return 'No answer from the Vanbay server. Check that it is running (npm start), then try again.';
    default:
      return `Signing in failed: the server answered ${error.status} (${error.message}).`;
  }
}

function waitText(details: unknown): string {
  const parsed = RateLimitDetailsSchema.safeParse(details);
  if (!parsed.success) return 'a few minutes';
  const minutes = Math.ceil(parsed.data.retryAfterSeconds / 60);
  return minutes === 1 ? '1 minute' : `${minutes} minutes`;
}
