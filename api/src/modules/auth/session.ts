// Reads the session cookie on every /api request: verifies the token, loads the person in one
// small query and sets req.user. A token that is invalid, expired, of an older session generation
// or of a disabled account counts as signed out (the cookie is cleared); the guards then answer 401
// on routes that need sign-in.
import type { NextFunction, Request, Response } from 'express';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { AppDeps } from '../../app';
import { ROLES, type Role } from '../../contracts/accounts';
import type { SessionUser } from './session-user';
import { SESSION_COOKIE, clearSessionCookie, setSessionCookie, shouldRenew, signSessionToken, verifySessionToken } from './tokens';

interface SessionRow {
  id: number;
  email: string;
  display_name: string;
  call_sign: string | null;
  disabled: number | boolean;
  session_generation: number;
  roles: string | null;
}

export interface LoadedUser extends SessionUser {
  disabled: boolean;
  sessionGeneration: number;
}

/** One query: the person's identity, state and roles. */
export async function loadSessionUser(sequelize: Sequelize, id: number): Promise<LoadedUser | undefined> {
  const rows = await sequelize.query<SessionRow>(
    `SELECT u.id, u.email, u.display_name, u.call_sign, u.disabled, u.session_generation,
            GROUP_CONCAT(r.role) AS roles
       FROM users u LEFT JOIN user_roles r ON r.user_id = u.id
      WHERE u.id = ? GROUP BY u.id`,
    { replacements: [id], type: QueryTypes.SELECT },
  );
  const row = rows[0];
  if (!row) return undefined;
  const held = new Set((row.roles ?? '').split(',').filter(Boolean));
  return {
    id: Number(row.id),
    email: row.email,
    displayName: row.display_name,
    callSign: row.call_sign,
    roles: ROLES.filter((r): r is Role => held.has(r)),
    disabled: !!row.disabled,
    sessionGeneration: Number(row.session_generation),
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

export function sessionMiddleware(deps: AppDeps) {
  const { config, sequelize } = deps;
  return async (req: Request, res: Response, next: NextFunction): Promise<void> => {
    req.user = undefined;
    const state = sessionState(res);
    const token: unknown = req.cookies?.[SESSION_COOKIE];
    if (typeof token !== 'string' || token === '') return next();

    const signed = verifySessionToken(config, token, { ignoreExpiration: true });
    if (signed) state.presentedSessionId = signed.jti;
    const claims = signed && verifySessionToken(config, token);
    const user = claims ? await loadSessionUser(sequelize, Number(claims.sub)) : undefined;
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
