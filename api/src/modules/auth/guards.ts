// Route guards: deny by default. Object ownership is checked in the services, which know the rows.
import type { NextFunction, Request, Response } from 'express';
import { ForbiddenError, UnauthenticatedError } from '../../errors';
import type { Role } from '../../contracts/accounts';
import type { SessionUser } from './session-user';

export function hasRole(user: SessionUser | undefined, ...roles: Role[]): boolean {
  return !!user && roles.some((r) => user.roles.includes(r));
}

/** The signed-in person, or a 401. */
export function currentUser(req: Request): SessionUser {
  if (!req.user) throw new UnauthenticatedError();
  return req.user;
}

export function requireSignedIn(req: Request, _res: Response, next: NextFunction): void {
  currentUser(req);
  next();
}

/** Passes when the signed-in person holds at least one of the roles. */
export function requireRole(...roles: Role[]) {
  return (req: Request, _res: Response, next: NextFunction): void => {
    const user = currentUser(req);
    if (!hasRole(user, ...roles)) throw new ForbiddenError();
    next();
  };
}
