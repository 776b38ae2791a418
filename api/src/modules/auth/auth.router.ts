// /api/auth: session, sign-in, sign-out, registration, password change and reset.
// Thin handlers: parse, call the service, set cookies, answer. The token is only ever in the
// HttpOnly cookie, never in a body.
import { Router, type Response } from 'express';
import { forRequest, type AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { backgroundWork } from '../../background';
import * as auth from './auth.service';
import { changePasswordBody, registerBody, resetConfirmBody, resetRequestBody, signInBody } from './auth.schemas';
import { issueCsrfCookie } from './csrf';
import { requireSignedIn, currentUser } from './guards';
import { sessionState } from './session';
import { anonymousFormLimiter, signInLimiters } from './throttle';
import { clearSessionCookie, setSessionCookie, signSessionToken } from './tokens';

export function createAuthRouter(deps: Pick<AppDeps, 'config' | 'sequelize' | 'logger' | 'clock'>): Router {
  const { config } = deps;
  const router = Router();

  /** Starts a session: new token (new session id) and an anti-forgery token bound to it. */
  function startSession(res: Response, signedIn: auth.SignedIn): void {
    const { token, sessionId } = signSessionToken(config, signedIn.user.id, signedIn.generation);
    setSessionCookie(res, config, token);
    issueCsrfCookie(res, config, sessionId);
    sessionState(res).sessionId = sessionId;
  }

  router.get('/session', (req, res) => {
    issueCsrfCookie(res, config, sessionState(res).sessionId);
    res.json({ user: req.user ? auth.publicUser(req.user) : null });
  });

  router.post('/sign-in', ...signInLimiters(deps), async (req, res) => {
    const body = parseInput(signInBody, req.body);
    const signedIn = await auth.signIn(forRequest(deps, req), null, body);
    startSession(res, signedIn);
    res.json({ user: signedIn.user });
  });

  router.post('/sign-out', requireSignedIn, async (req, res) => {
    await auth.endSessions(forRequest(deps, req), currentUser(req));
    req.log?.info({ event: 'sign_out', userId: currentUser(req).id }, 'signed out; sessions ended');
    clearSessionCookie(res, config);
    issueCsrfCookie(res, config);
    res.status(204).end();
  });

  router.post('/register', anonymousFormLimiter(deps, 'register-addr', 'registrations'), async (req, res) => {
    const body = parseInput(registerBody, req.body);
    const signedIn = await auth.register(forRequest(deps, req), null, body);
    startSession(res, signedIn);
    res.status(201).json({ user: signedIn.user });
  });

  router.post('/password', requireSignedIn, async (req, res) => {
    const body = parseInput(changePasswordBody, req.body);
    const signedIn = await auth.changePassword(forRequest(deps, req), currentUser(req), body);
    startSession(res, signedIn);
    res.status(204).end();
  });

  router.post('/password-reset/request', anonymousFormLimiter(deps, 'reset-addr', 'password-reset requests'), (req, res) => {
    const body = parseInput(resetRequestBody, req.body);
    // Answer first, then do the work: the answer takes the same time whether or not the address
    // has an account (no lookup, hashing or mail in front of it).
    res.status(202).json({ message: 'If an account uses that address, a reset link is on its way.' });
    backgroundWork.run('password reset request', req.log, () => auth.requestPasswordReset(forRequest(deps, req), null, body));
  });

  router.post('/password-reset/confirm', anonymousFormLimiter(deps, 'reset-confirm-addr', 'password-reset attempts'), async (req, res) => {
    const body = parseInput(resetConfirmBody, req.body);
    await auth.confirmPasswordReset(forRequest(deps, req), null, body);
    res.status(204).end();
  });

  return router;
}
