import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { Page } from '@contracts/lists';
import type { TicketRow } from '@contracts/tickets';

/** What the Flasher asks of the API beside the firmware routes (FirmwareApi) and tickets (TicketApi). */
@Injectable({ providedIn: 'root' })
export class FlasherApi {
  private readonly http = inject(HttpClient);

  /** Tickets in the Reflash lane, longest waiting first (one page of 100 is plenty for a club bench). */
  reflashTickets(): Observable<TicketRow[]> {
    return this.http
      .get<Page<TicketRow>>('/api/tickets', { params: { state: 'reflash', sort: 'stateSince', dir: 'asc', page: 1, pageSize: 100 } })
      .pipe(map((p) => p.items));
  }

  /** The image's exact bytes from the library, to check and send. */
  imageBytes(id: number): Observable<Uint8Array> {
    return this.http
      .get(`/api/firmware/${encodeURIComponent(String(id))}/download`, { responseType: 'arraybuffer' })
      .pipe(map((b) => new Uint8Array(b)));
  }
}
