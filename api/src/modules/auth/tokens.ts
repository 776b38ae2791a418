// Session tokens: a short-lived JWT (HS256 pinned) in the HttpOnly cookie rw_session.
// Claims: iss, aud, exp, sub (user id), gen (the user's session generation), jti (session id,
// which the anti-forgery token is bound to), at (when the person signed in, seconds since epoch).
// A token past half its life is renewed on use (same session id) so a long club evening does not
// sign anyone out mid-job, but never beyond MAX_SESSION_HOURS after signing in.
import jwt from 'jsonwebtoken';
import { randomBytes } from 'node:crypto';
import type { Response } from 'express';
import type { Config } from '../../config';

export const SESSION_COOKIE = 'rw_session';
export const TOKEN_ISSUER = 'rigwright';
export const TOKEN_AUDIENCE = 'rigwright-web';

export const MAX_SESSION_HOURS = 12;

export interface SessionClaims {
  sub: string;
  gen: number;
  jti: string;
  /** Expiry, seconds since epoch. */
  exp: number;
  /** Sign-in time, seconds since epoch. */
  at: number;
}

export interface IssuedSession {
  token: string;
  sessionId: string;
}

/** Signs a new session, or with `continued` a renewed token for the same session. */
export function signSessionToken(
  config: Config,
  userId: number,
  generation: number,
  continued?: { sessionId: string; signedInAt: number },
): IssuedSession {
  const sessionId = continued?.sessionId ?? randomBytes(16).toString('base64url');
  const signedInAt = continued?.signedInAt ?? Math.floor(Date.now() / 1000);
  const token = jwt.sign({ gen: generation, at: signedInAt }, config.RW_JWT_SECRET, {
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
  const { sub, gen, jti, exp, at } = payload;
  // jsonwebtoken accepts a token without exp; ours always carry one.
  if (typeof exp !== 'number') return undefined;
  if (typeof at !== 'number' || !Number.isInteger(at) || at <= 0) return undefined;
  if (typeof sub !== 'string' || !/^[1-9][0-9]{0,9}$/.test(sub)) return undefined;
  if (typeof gen !== 'number' || !Number.isInteger(gen) || gen < 0) return undefined;
  if (typeof jti !== 'string' || jti.length < 16 || jti.length > 64) return undefined;
  return { sub, gen, jti, exp, at };
}

/** True when a valid token should be replaced by a fresh one for the same session. */
export function shouldRenew(config: Config, claims: SessionClaims, nowMs = Date.now()): boolean {
  const lifeMs = config.RW_SESSION_MINUTES * 60 * 1000;
  const leftMs = claims.exp * 1000 - nowMs;
  const withinMaximum = nowMs + lifeMs <= (claims.at + MAX_SESSION_HOURS * 3600) * 1000;
  return leftMs < lifeMs / 2 && withinMaximum;
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
