/** Session tokens: HS256 JWTs signed with jose, carrying the user, the business and the token version. */
import { randomUUID } from 'node:crypto';
import { jwtVerify, SignJWT } from 'jose';

export const SESSION_TTL_SECONDS = 7 * 24 * 60 * 60;
const ISSUER = 'vanbay';

export interface SessionClaims {
  userId: number;
  businessId: number;
  tokenVersion: number;
  jti: string;
  expiresAt: Date;
}

export async function signSession(
  secret: Uint8Array,
  user: { id: number; businessId: number; tokenVersion: number },
  now: Date,
): Promise<{ token: string; claims: SessionClaims }> {
  const jti = randomUUID();
  const issuedAt = Math.floor(now.getTime() / 1000);
  const expiresAt = issuedAt + SESSION_TTL_SECONDS;
  const token = await new SignJWT({ bid: user.businessId, ver: user.tokenVersion })
    .setProtectedHeader({ alg: 'HS256' })
    .setIssuer(ISSUER)
    .setSubject(String(user.id))
    .setJti(jti)
    .setIssuedAt(issuedAt)
    .setExpirationTime(expiresAt)
    .sign(secret);
  return {
    token,
    claims: {
      userId: user.id,
      businessId: user.businessId,
      tokenVersion: user.tokenVersion,
      jti,
      expiresAt: new Date(expiresAt * 1000),
    },
  };
}

/** The claims of a valid token, or null for anything expired, tampered or malformed. */
export async function verifySession(
  secret: Uint8Array,
  token: string,
  now: Date,
): Promise<SessionClaims | null> {
  try {
    const { payload } = await jwtVerify(token, secret, {
      algorithms: ['HS256'],
      issuer: ISSUER,
      currentDate: now,
      requiredClaims: ['sub', 'jti', 'exp'],
    });
    const userId = Number(payload.sub);
    const { bid, ver } = payload as { bid?: unknown; ver?: unknown };
    if (!Number.isInteger(userId) || typeof bid !== 'number' || typeof ver !== 'number') return null;
    return {
      userId,
      businessId: bid,
      tokenVersion: ver,
      jti: payload.jti!,
      expiresAt: new Date(payload.exp! * 1000),
    };
  } catch {
    return null;
  }
}
