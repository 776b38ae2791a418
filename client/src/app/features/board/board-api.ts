import { HttpClient } from '@angular/common/http';
import { Injectable, InjectionToken, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import { queryParams } from '../../core/http/api-error';
import { Board, BoardFilter, LiveSignal, LoadedBoard } from './board.models';

/** Opens a server-sent event stream; a token so tests can hand in a fake (jsdom has no EventSource). */
export const EVENT_SOURCE_FACTORY = new InjectionToken<(url: string) => EventSource>('EVENT_SOURCE_FACTORY', {
  providedIn: 'root',
  factory: () => (url: string) => new EventSource(url),
});

/** EventSource.CLOSED (a constant, so this file loads where EventSource does not exist). */
const CLOSED = 2;

/** The Bench board routes. Moves go through TicketApi.move (`POST /api/tickets/:tag/moves`). */
@Injectable({ providedIn: 'root' })
export class BoardApi {
  private readonly http = inject(HttpClient);
  private readonly openEventSource = inject(EVENT_SOURCE_FACTORY);

  board(filter: BoardFilter): Observable<LoadedBoard> {
    return this.http.get<Board>('/api/board', { params: queryParams(filter), observe: 'response' }).pipe(
      map((res) => ({ ...(res.body as Board), revision: res.headers.get('X-Board-Revision'), q: filter.q ?? '' })),
    );
  }

  /**
   * The live stream of board revisions. While the browser reconnects by itself after a dropped
   * connection it says `lost`, then `open` again. When the server refuses the stream (signed out,
   * server away) the browser gives up and the observable errors, so the caller can retry and
   * check the session. Unsubscribing closes the stream.
   */
  revisions(): Observable<LiveSignal> {
    return new Observable<LiveSignal>((subscriber) => {
      const source = this.openEventSource('/api/board/events');
      source.addEventListener('revision', (event) => {
        try {
          const data = JSON.parse((event as MessageEvent<string>).data) as { revision: string | null };
          subscriber.next({ kind: 'revision', revision: data.revision });
        } catch {
          // A garbled event changes nothing; the next one will do.
        }
      });
      // The server ends each stream after a while (so the session is checked again) and says so
      // first: the browser's reconnect that follows is not a lost connection.
      let planned = false;
      source.addEventListener('reconnect', () => (planned = true));
      source.onopen = () => {
        planned = false;
        subscriber.next({ kind: 'open' });
      };
      source.onerror = () => {
        if (source.readyState === CLOSED) subscriber.error(new Error('The board stream was closed.'));
        else if (planned) planned = false;
        else subscriber.next({ kind: 'lost' });
      };
      return () => source.close();
    });
  }
}
