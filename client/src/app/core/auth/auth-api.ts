import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { HANDLES_OWN_ERRORS } from '../http/api-error';
import { ChangePasswordBody, RegisterBody, ResetConfirmBody, SignInBody, User } from './auth.models';

/** The auth routes of the API. Forms show their own errors, so these requests are marked. */
@Injectable({ providedIn: 'root' })
export class AuthApi {
  private readonly http = inject(HttpClient);
  private readonly ownErrors = () => ({ context: new HttpContext().set(HANDLES_OWN_ERRORS, true) });

  session(): Observable<{ user: User | null }> {
    return this.http.get<{ user: User | null }>('/api/auth/session', this.ownErrors());
  }

  signIn(body: SignInBody): Observable<{ user: User }> {
    return this.http.post<{ user: User }>('/api/auth/sign-in', body, this.ownErrors());
  }

  signOut(): Observable<void> {
    return this.http.post<void>('/api/auth/sign-out', {});
  }

  register(body: RegisterBody): Observable<{ user: User }> {
    return this.http.post<{ user: User }>('/api/auth/register', body, this.ownErrors());
  }

  changePassword(body: ChangePasswordBody): Observable<void> {
    return this.http.post<void>('/api/auth/password', body, this.ownErrors());
  }

  requestPasswordReset(email: string): Observable<void> {
    return this.http.post<void>('/api/auth/password-reset/request', { email }, this.ownErrors());
  }

  confirmPasswordReset(body: ResetConfirmBody): Observable<void> {
    return this.http.post<void>('/api/auth/password-reset/confirm', body, this.ownErrors());
  }
}
