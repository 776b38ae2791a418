import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { Page } from '@contracts/lists';
import { HANDLES_OWN_ERRORS, queryParams } from '../../core/http/api-error';
import { AccountQuery, CreateAccountBody, UpdateAccountBody, UserRow } from './account.models';

/** The accounts routes of the API (admins only). */
@Injectable({ providedIn: 'root' })
export class AccountApi {
  private readonly http = inject(HttpClient);

  list(query: AccountQuery): Observable<Page<UserRow>> {
    return this.http.get<Page<UserRow>>('/api/users', { params: queryParams(query) });
  }

  /** The account form shows field errors itself (e.g. 409 email_taken on the e-mail field). */
  create(body: CreateAccountBody): Observable<UserRow> {
    return this.http.post<UserRow>('/api/users', body, { context: new HttpContext().set(HANDLES_OWN_ERRORS, true) });
  }

  update(id: UserRow['id'], body: UpdateAccountBody, ownErrors = false): Observable<UserRow> {
    return this.http.patch<UserRow>(`/api/users/${encodeURIComponent(String(id))}`, body, {
      context: new HttpContext().set(HANDLES_OWN_ERRORS, ownErrors),
    });
  }
}
