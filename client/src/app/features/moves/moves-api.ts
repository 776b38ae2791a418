import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { TechnicianOption } from '@contracts/moves';
import type { TicketDetail } from '@contracts/tickets';
import { HANDLES_OWN_ERRORS, SESSION_ENDS_ON_401 } from '../../core/http/api-error';

export type { TechnicianOption };

/** Callers say what went wrong themselves (the board puts things back); a 401 still goes to sign-in. */
const OWN_ERRORS = () => new HttpContext().set(HANDLES_OWN_ERRORS, true).set(SESSION_ENDS_ON_401, true);

/** Undo of a move, the parts-on-order flag and technician assignment (api/src/modules/moves). */
@Injectable({ providedIn: 'root' })
export class MovesApi {
  private readonly http = inject(HttpClient);

  undo(tag: string, eventId: number, version: number): Observable<TicketDetail> {
    return this.http.post<TicketDetail>(`/api/tickets/${encodeURIComponent(tag)}/moves/${eventId}/undo`, { version }, { context: OWN_ERRORS() });
  }

  setPartsOnOrder(tag: string, partsOnOrder: boolean): Observable<TicketDetail> {
    return this.http.post<TicketDetail>(`/api/tickets/${encodeURIComponent(tag)}/parts-on-order`, { partsOnOrder }, { context: OWN_ERRORS() });
  }

  assign(tag: string, technicianId: number | null): Observable<TicketDetail> {
    return this.http.post<TicketDetail>(`/api/tickets/${encodeURIComponent(tag)}/technician`, { technicianId }, { context: OWN_ERRORS() });
  }

  technicians(): Observable<TechnicianOption[]> {
    return this.http.get<{ items: TechnicianOption[] }>('/api/technicians').pipe(map((r) => r.items));
  }
}

/** How long the snack bar offers Undo: until the server's deadline, less a second for the request, at least 2 s. */
export function undoWindowMs(until: string, now = Date.now()): number {
  return Math.max(2_000, Math.min(60_000, Date.parse(until) - now - 1_000));
}
