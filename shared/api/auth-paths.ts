/**
 * The sign-in routes and cookie name, without zod: the dashboard's first load asks /me with these
 * and only then loads the schemas that read the answers (`auth.ts` re-exports them).
 */
export const SIGN_IN_PATH = '/api/auth/sign-in';
export const SIGN_OUT_PATH = '/api/auth/sign-out';
export const ME_PATH = '/api/auth/me';
export const PASSWORD_PATH = '/api/auth/password';
/** The browser's session cookie: httpOnly, SameSite=Strict. */
export const SESSION_COOKIE = 'vanbay_session';
