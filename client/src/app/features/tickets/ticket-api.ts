import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { Page } from '@contracts/lists';
import { HANDLES_OWN_ERRORS, SESSION_ENDS_ON_401, queryParams } from '../../core/http/api-error';
import { IntakeBody, IntakeEditBody, MoveBody, OwnerSuggestion, TicketDetail, TicketQuery, TicketRow } from './ticket.models';

/** The ticket routes of the API. */
@Injectable({ providedIn: 'root' })
export class TicketApi {
  private readonly http = inject(HttpClient);

  list(query: TicketQuery): Observable<Page<TicketRow>> {
    return this.http.get<Page<TicketRow>>('/api/tickets', { params: queryParams(query) });
  }

  get(tag: string): Observable<TicketDetail> {
    return this.http.get<TicketDetail>(`/api/tickets/${encodeURIComponent(tag)}`);
  }

  /** The intake form shows field errors itself. */
  create(body: IntakeBody): Observable<TicketDetail> {
    return this.http.post<TicketDetail>('/api/tickets', body, {
      context: new HttpContext().set(HANDLES_OWN_ERRORS, true),
    });
  }

  /**
   * Callers handle 409 (stale version) and 422 (move refused) themselves: they put things back.
   * A 401 (the session ended, perhaps in the middle of a drag) still goes to sign-in.
   */
  move(tag: string, body: MoveBody): Observable<TicketDetail> {
    return this.http.post<TicketDetail>(`/api/tickets/${encodeURIComponent(tag)}/moves`, body, {
      context: new HttpContext().set(HANDLES_OWN_ERRORS, true).set(SESSION_ENDS_ON_401, true),
    });
  }

  /** Members a technician may hand in for (name, e-mail or call sign). */
  searchOwners(q: string): Observable<{ items: OwnerSuggestion[] }> {
    return this.http.get<{ items: OwnerSuggestion[] }>('/api/tickets/owners', { params: { q } });
  }

  /** The edit form shows field errors and the 409 itself. */
  editIntake(tag: string, body: IntakeEditBody): Observable<TicketDetail> {
    return this.http.patch<TicketDetail>(`/api/tickets/${encodeURIComponent(tag)}/intake`, body, {
      context: new HttpContext().set(HANDLES_OWN_ERRORS, true),
    });
  }

  /** The printable intake tag (a link the browser opens; not fetched through HttpClient). */
  intakeTagUrl(tag: string): string {
    return `/api/tickets/${encodeURIComponent(tag)}/intake-tag.pdf`;
  }
}
