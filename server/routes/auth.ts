import { Router, type Response } from 'express';
import {
  ChangePasswordInputSchema,
  ME_PATH,
  PASSWORD_PATH,
  SESSION_COOKIE,
  SIGN_IN_PATH,
  SIGN_OUT_PATH,
  SignInInputSchema,
} from '../../shared/api/auth';
import type { SessionClaims } from '../auth/tokens';
import { UnauthorizedError } from '../errors';
import { parse } from '../http/validate';
import {
  changePassword,
  RateLimitedError,
  sessionUser,
  signIn,
  signOut,
  type AuthContext,
} from '../services/auth';

function setSessionCookie(res: Response, token: string, claims: SessionClaims, secure: boolean, now: Date) {
  res.cookie(SESSION_COOKIE, token, {
    httpOnly: true,
    sameSite: 'strict',
    secure,
    path: '/',
    // Relative, so the browser's clock and the server's need not agree to the second.
    maxAge: Math.max(0, claims.expiresAt.getTime() - now.getTime()),
  });
}

export function authRouter(ctx: AuthContext) {
  const router = Router();

  router.post(SIGN_IN_PATH, async (req, res) => {
    const input = parse(SignInInputSchema, req.body);
    try {
      const session = await signIn(ctx, input, req.ip ?? 'unknown');
      setSessionCookie(res, session.token, session.claims, req.secure, ctx.now());
      res.json({ token: session.token, user: session.user });
    } catch (error) {
      if (error instanceof RateLimitedError) res.set('Retry-After', String(error.retryAfterSeconds));
      throw error;
    }
  });

  router.post(SIGN_OUT_PATH, async (req, res) => {
    if (!req.actor) throw new UnauthorizedError();
    await signOut(ctx.db, req.actor, ctx.now());
    res.clearCookie(SESSION_COOKIE, { path: '/' });
    res.status(204).end();
  });

  router.get(ME_PATH, (req, res) => {
    if (!req.actor) throw new UnauthorizedError();
    res.json({ user: sessionUser({ ...req.actor, id: req.actor.userId }) });
  });

  router.post(PASSWORD_PATH, async (req, res) => {
    if (!req.actor) throw new UnauthorizedError();
    const input = parse(ChangePasswordInputSchema, req.body);
    const session = await changePassword(ctx, req.actor, input);
    if (req.authVia === 'cookie') setSessionCookie(res, session.token, session.claims, req.secure, ctx.now());
    res.json({ token: session.token, user: session.user });
  });

  return router;
}
