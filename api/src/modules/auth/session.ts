// Reads the session cookie on every /api request: verifies the token, loads the person in one
// small query and sets req.user. A token that is invalid, expired, of an older session generation
// or of a disabled account counts as signed out (the cookie is cleared); the guards then answer 401
// on routes that need sign-in.
import type { NextFunction, Request, Response } from 'express';
import type { AppDeps } from '../../deps';
import { User } from '../users/user.model';
import type { SessionUser } from './session-user';
import { SESSION_COOKIE, clearSessionCookie, setSessionCookie, shouldRenew, signSessionToken, verifySessionToken } from './tokens';

export interface LoadedUser extends SessionUser {
  disabled: boolean;
  sessionGeneration: number;
}

/** The person's identity, state and roles: one query (users with user_roles, through the model's association). */
export async function loadSessionUser(id: number): Promise<LoadedUser | undefined> {
  const user = await User.findByPk(id, {
    attributes: ['id', 'email', 'displayName', 'callSign', 'disabled', 'sessionGeneration'],
    include: [{ association: 'roleRows', attributes: ['userId', 'role'] }],
  });
  if (!user) return undefined;
  return {
    id: user.id,
    email: user.email,
    displayName: user.displayName,
    callSign: user.callSign,
    roles: user.roles,
    disabled: !!user.disabled,
    sessionGeneration: user.sessionGeneration,
  };
}

/** What the session middleware learned about this request, kept on res.locals. */
export interface SessionState {
  /** The accepted session's id (jti), when req.user is set. */
  sessionId?: string;
  /**
   * The id of any correctly signed session token the request carried, even an expired or revoked
   * one: the anti-forgery check of this request is bound to it.
   */
  presentedSessionId?: string;
}

export function sessionState(res: Response): SessionState {
  return (res.locals.rwSession ??= {}) as SessionState;
}

export function sessionMiddleware(deps: Pick<AppDeps, 'config'>) {
  const { config } = deps;
  return async (req: Request, res: Response, next: NextFunction): Promise<void> => {
    req.user = undefined;
    const state = sessionState(res);
    const token: unknown = req.cookies?.[SESSION_COOKIE];
    if (typeof token !== 'string' || token === '') return next();

    const signed = verifySessionToken(config, token, { ignoreExpiration: true });
    if (signed) state.presentedSessionId = signed.jti;
    const claims = signed && verifySessionToken(config, token);
    const user = claims ? await loadSessionUser(Number(claims.sub)) : undefined;
    if (!claims || !user || user.disabled || user.sessionGeneration !== claims.gen) {
      clearSessionCookie(res, config);
      return next();
    }
    state.sessionId = claims.jti;
    if (shouldRenew(config, claims)) {
      const renewed = signSessionToken(config, user.id, user.sessionGeneration, { sessionId: claims.jti, signedInAt: claims.at });
      setSessionCookie(res, config, renewed.token);
    }
    req.user = { id: user.id, email: user.email, displayName: user.displayName, callSign: user.callSign, roles: user.roles };
    next();
  };
}
