// Anti-forgery: a signed double-submit token. The server sets the readable cookie XSRF-TOKEN;
// every state-changing /api request must echo it in header X-XSRF-TOKEN (Angular's HttpClient does
// this by itself). The token is `<nonce>.<mac>`, mac = HMAC-SHA256 over the session id it is bound
// to (empty for no session) and the nonce, so a token planted from elsewhere or taken from another
// session does not pass. OWASP CSRF Prevention Cheat Sheet, "Signed Double-Submit Cookie".
import type { NextFunction, Request, Response } from 'express';
import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { AppDeps } from '../../deps';
import type { Config } from '../../config';
import { ForbiddenError } from '../../errors';
import { sessionState } from './session';

export const CSRF_COOKIE = 'XSRF-TOKEN';
export const CSRF_HEADER = 'x-xsrf-token';
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Paths under /api (as seen inside the /api mount, e.g. '/payments/webhook') that skip the check
 * because they authenticate another way (the payment provider's signed webhook). Add to it only
 * for a route that verifies its own signature.
 */
export const csrfExemptPaths = new Set<string>();

function macKey(config: Config): Buffer {
  // A key of its own, derived from the app secret, so a MAC here is never a valid JWT signature.
  return createHash('sha256').update(`rigwright-csrf\0${config.RW_JWT_SECRET}`).digest();
}

function mac(config: Config, sessionId: string, nonce: string): string {
  return createHmac('sha256', macKey(config)).update(`${sessionId}\0${nonce}`).digest('base64url');
}

export function createCsrfToken(config: Config, sessionId = ''): string {
  const nonce = randomBytes(18).toString('base64url');
  return `${nonce}.${mac(config, sessionId, nonce)}`;
}

export function csrfTokenValid(config: Config, token: string, sessionId = ''): boolean {
  const [nonce, given, extra] = token.split('.');
  if (!nonce || !given || extra !== undefined) return false;
  const expected = Buffer.from(mac(config, sessionId, nonce));
  const actual = Buffer.from(given);
  return actual.length === expected.length && timingSafeEqual(actual, expected);
}

/** Sets a fresh XSRF-TOKEN cookie bound to the given session (none: anonymous). */
export function issueCsrfCookie(res: Response, config: Config, sessionId?: string): void {
  // One XSRF-TOKEN per response: a later issue (e.g. after sign-in) replaces an earlier one.
  const existing = res.getHeader('Set-Cookie');
  if (Array.isArray(existing)) {
    res.setHeader('Set-Cookie', existing.filter((c) => !c.startsWith(`${CSRF_COOKIE}=`)));
  }
  res.cookie(CSRF_COOKIE, createCsrfToken(config, sessionId ?? ''), {
    httpOnly: false, // the client must read it to echo it
    secure: config.RW_COOKIE_SECURE,
    sameSite: 'strict',
    path: '/',
  });
}

function sameString(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

export function csrfProtection(deps: Pick<AppDeps, 'config'>, options: { exemptPaths?: Iterable<string> } = {}) {
  const { config } = deps;
  const exempt = new Set(options.exemptPaths ?? []);
  return (req: Request, res: Response, next: NextFunction): void => {
    const state = sessionState(res);
    const cookie: unknown = req.cookies?.[CSRF_COOKIE];
    if (SAFE_METHODS.has(req.method)) {
      if (typeof cookie !== 'string' || !csrfTokenValid(config, cookie, state.sessionId ?? '')) {
        issueCsrfCookie(res, config, state.sessionId);
      }
      return next();
    }
    if (exempt.has(req.path) || csrfExemptPaths.has(req.path)) return next();

    const header = req.get(CSRF_HEADER);
    const ok =
      typeof cookie === 'string' &&
      typeof header === 'string' &&
      sameString(cookie, header) &&
      csrfTokenValid(config, header, state.presentedSessionId ?? '');
    if (!ok) {
      req.log?.warn({ method: req.method, path: req.originalUrl.split('?')[0] }, 'anti-forgery token missing or invalid');
      // A fresh cookie for this state, so a client can fetch it again and retry once.
      issueCsrfCookie(res, config, state.sessionId);
      throw new ForbiddenError('The anti-forgery token is missing or out of date. Reload the page and try again.', 'csrf_token_invalid');
    }
    next();
  };
}
