import { parse as parseCookie } from 'cookie';
import type { RequestHandler } from 'express';
import { SESSION_COOKIE } from '../../shared/api/auth';
import { ForbiddenError, UnauthorizedError } from '../errors';
import { actorFromToken, type AuthContext } from '../services/auth';
import { isAllowed, type Action, type Resource } from './policy';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

function tokenOf(header: string | undefined, cookies: string | undefined) {
  const bearer = /^Bearer\s+(\S+)$/i.exec(header ?? '');
  if (bearer) return { token: bearer[1]!, via: 'bearer' as const };
  const cookie = cookies ? parseCookie(cookies)[SESSION_COOKIE] : undefined;
  return cookie ? { token: cookie, via: 'cookie' as const } : null;
}

/**
 * Reads the session from `Authorization: Bearer` (the CLI) or the session cookie (the browser).
 * No credentials leaves the request anonymous for `allow` to refuse; bad credentials are a 401
 * at once, so a stale token never reads as "signed out but fine".
 */
export function authenticate(ctx: Omit<AuthContext, 'limits'>): RequestHandler {
  return async (req, _res, next) => {
    const found = tokenOf(req.headers.authorization, req.headers.cookie);
    if (!found) return next();
    const actor = await actorFromToken(ctx, found.token);
    if (!actor)
      return next(
        new UnauthorizedError('Your session has expired or is not valid: sign in again.', 'invalid_token'),
      );
    if (found.via === 'cookie' && !SAFE_METHODS.has(req.method) && isCrossSite(req.headers)) {
      // The cookie rides along on any request the browser makes; a write from another site is refused.
      return next(new ForbiddenError('Cross-site request refused.'));
    }
    req.actor = actor;
    req.authVia = found.via;
    next();
  };
}

function isCrossSite(headers: Record<string, string | string[] | undefined>): boolean {
  const site = headers['sec-fetch-site'];
  if (site === 'cross-site') return true;
  const origin = headers.origin;
  if (typeof origin !== 'string' || origin === 'null') return origin === 'null';
  try {
    return new URL(origin).host !== headers.host;
  } catch {
    return true;
  }
}

/** The policy table's word on this route: 401 when signed out, 403 when the role may not. */
export function allow(resource: Resource, action: Action): RequestHandler {
  return (req, _res, next) => {
    if (!req.actor) return next(new UnauthorizedError());
    if (!isAllowed(req.actor.role, resource, action)) return next(new ForbiddenError());
    next();
  };
}
