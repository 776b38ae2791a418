import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { queryParams } from '../../core/http/api-error';
import { Board, BoardFilter } from './board.models';

/** The Bench board route. Moves go through TicketApi.move (`POST /api/tickets/:tag/moves`). */
@Injectable({ providedIn: 'root' })
export class BoardApi {
  private readonly http = inject(HttpClient);

  board(filter: BoardFilter): Observable<Board> {
    return this.http.get<Board>('/api/board', { params: queryParams(filter) });
  }
}
