// Session tokens: a short-lived JWT (HS256 pinned) in the HttpOnly cookie rw_session.
// Claims: iss, aud, exp, sub (user id), gen (the user's session generation), jti (session id,
// which the anti-forgery token is bound to).
import jwt from 'jsonwebtoken';
import { randomBytes } from 'node:crypto';
import type { Response } from 'express';
import type { Config } from '../../config';

export const SESSION_COOKIE = 'rw_session';
export const TOKEN_ISSUER = 'rigwright';
export const TOKEN_AUDIENCE = 'rigwright-web';

export interface SessionClaims {
  sub: string;
  gen: number;
  jti: string;
}

export interface IssuedSession {
  token: string;
  sessionId: string;
}

export function signSessionToken(config: Config, userId: number, generation: number): IssuedSession {
  const sessionId = randomBytes(16).toString('base64url');
  const token = jwt.sign({ gen: generation }, config.RW_JWT_SECRET, {
    algorithm: 'HS256',
    issuer: TOKEN_ISSUER,
    audience: TOKEN_AUDIENCE,
    subject: String(userId),
    jwtid: sessionId,
    expiresIn: config.RW_SESSION_MINUTES * 60,
  });
  return { token, sessionId };
}

function parseClaims(payload: string | jwt.JwtPayload): SessionClaims | undefined {
  if (typeof payload === 'string') return undefined;
  const { sub, gen, jti, exp } = payload;
  // jsonwebtoken accepts a token without exp; ours always carry one.
  if (typeof exp !== 'number') return undefined;
  if (typeof sub !== 'string' || !/^[1-9][0-9]{0,9}$/.test(sub)) return undefined;
  if (typeof gen !== 'number' || !Number.isInteger(gen) || gen < 0) return undefined;
  if (typeof jti !== 'string' || jti.length < 16 || jti.length > 64) return undefined;
  return { sub, gen, jti };
}

/** The claims of a valid token (signature, algorithm, issuer, audience, expiry), or undefined. */
export function verifySessionToken(config: Config, token: string, options: { ignoreExpiration?: boolean } = {}): SessionClaims | undefined {
  try {
    const payload = jwt.verify(token, config.RW_JWT_SECRET, {
      algorithms: ['HS256'],
      issuer: TOKEN_ISSUER,
      audience: TOKEN_AUDIENCE,
      ignoreExpiration: options.ignoreExpiration ?? false,
    });
    return parseClaims(payload);
  } catch {
    return undefined;
  }
}

export function setSessionCookie(res: Response, config: Config, token: string): void {
  res.cookie(SESSION_COOKIE, token, {
    httpOnly: true,
    secure: config.RW_COOKIE_SECURE,
    sameSite: 'strict',
    path: '/',
    maxAge: config.RW_SESSION_MINUTES * 60 * 1000,
  });
}

export function clearSessionCookie(res: Response, config: Config): void {
  res.clearCookie(SESSION_COOKIE, { httpOnly: true, secure: config.RW_COOKIE_SECURE, sameSite: 'strict', path: '/' });
}
