import { inject } from '@angular/core';
import { CanActivateFn, RedirectFunction, Router } from '@angular/router';
import { Role } from './auth.models';
import { SessionStore } from './session-store';

/** Lets signed-in people through; others go to sign in and come back afterwards. */
export const signedInGuard: CanActivateFn = (_route, state) => {
  const session = inject(SessionStore);
  if (session.signedIn()) return true;
  return inject(Router).createUrlTree(['/sign-in'], { queryParams: { next: state.url } });
};

/** Hides pages a role may not use. Only hides: the server refuses anyway. */
export function roleGuard(...roles: Role[]): CanActivateFn {
  return (_route, state) => {
    const session = inject(SessionStore);
    const router = inject(Router);
    if (!session.signedIn()) return router.createUrlTree(['/sign-in'], { queryParams: { next: state.url } });
    return session.hasAnyRole(...roles) ? true : router.createUrlTree(['/']);
  };
}

/** Signed-out pages (sign in, register): a signed-in person goes home instead. */
export const signedOutGuard: CanActivateFn = () =>
  inject(SessionStore).signedIn() ? inject(Router).createUrlTree(['/']) : true;

/** Home: technicians and admins start at the Bench board, everyone else at their tickets. */
export const homeRedirect: RedirectFunction = () => {
  const session = inject(SessionStore);
  if (!session.signedIn()) return '/sign-in';
  return session.worksTheBench() ? '/board' : '/tickets';
};
