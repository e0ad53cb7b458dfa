import { ApiError } from '../../../lib/api-client';

/** A failed request in one line the mechanic can act on. */
export function failureText(error: Error): string {
  if (error instanceof ApiError && error.status === 0) {
    return 'the Vanbay server did not answer. Check the connection to the van, then try again.';
  }
  if (error instanceof ApiError && error.status === 403) return 'your sign-in may not do this.';
  if (error instanceof ApiError) return error.message;
  return error.message;
}
